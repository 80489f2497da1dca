/**
 * Input the grazing arithmetic refuses, with the request field it blames (a yup-style path such as
 * `moves[2].change`), so the server can answer 400 with `fields: { [field]: message }` and a form can
 * show the message beside the input. Money and date helpers throw it too: one class for the server to map.
 */
export class GrazingInputError extends Error {
  readonly field: string;

  constructor(field: string, message: string) {
    super(message);
    this.name = 'GrazingInputError';
    this.field = field;
    // Keeps `instanceof` working when the server is compiled to an ES5-style class hierarchy.
    Object.setPrototypeOf(this, new.target.prototype);
  }
}
