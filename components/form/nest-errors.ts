// Formik reads a field's error by path through nested objects and arrays; schemas and the API give flat paths.

/** Formik reads errors by path into nested objects/arrays: { 'samples[0].dryGrams': m } → { samples: [{ dryGrams: m }] }. */
export function nestErrors(flat: Record<string, string>): Record<string, unknown> {
  const root: Record<string, unknown> = {};
  for (const [path, msg] of Object.entries(flat)) {
    const keys = path.replace(/\[(\d+)\]/g, '.$1').split('.');
    let node: Record<string, unknown> = root;
    keys.forEach((k, i) => {
      if (i === keys.length - 1) {
        if (node[k] === undefined) node[k] = msg;
        return;
      }
      const nextIsIndex = /^\d+$/.test(keys[i + 1]);
      if (typeof node[k] !== 'object' || node[k] === null) node[k] = nextIsIndex ? [] : {};
      node = node[k] as Record<string, unknown>;
    });
  }
  return root;
}
