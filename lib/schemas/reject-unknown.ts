import * as yup from 'yup';

// Unknown fields are refused, each at its own path ("sprayRecords[0].prodcut" → "Unknown field: prodcut"),
// because a misspelt optional field (timeZone, feesCents) would otherwise silently change the answer.
// yup's own noUnknown() reports every unknown key of an object under the object's path in one message;
// this names each one where a form can show it. It tests the value without asking the cast to strip, so
// it fails under `stripUnknown: false` (the server's setting).
// (It avoids `this.originalValue`: yup 1.7 writes it into the options object, so a caller reusing one
// options object across validations would see a previous body there.)

export function rejectUnknown<S extends yup.AnyObjectSchema>(schema: S): S {
  const known = new Set(Object.keys(schema.fields));
  return schema.test('no-unknown', 'Unknown field', function (value: unknown) {
    if (value === null || typeof value !== 'object' || Array.isArray(value)) return true;
    const errors = Object.keys(value)
      .filter((key) => !known.has(key))
      .map((key) => this.createError({ path: this.path ? `${this.path}.${key}` : key, message: `Unknown field: ${key}` }));
    return errors.length === 0 ? true : new yup.ValidationError(errors);
  }) as S;
}

