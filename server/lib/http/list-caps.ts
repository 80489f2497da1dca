import type { AnySchema } from 'yup';
import type { FieldErrors } from '../errors/app-error';

// Every list a Fieldfold schema accepts has a cap (its own `.max()`), but yup casts and checks every item of a
// list before it reports the list too long: a body of 30 000 numbers where two roles belong took the server
// many seconds to refuse. Here the caps are read from the schema itself (each array's `max` test, its message
// too) and held against the body's lists before yup sees an item, so the work a request can cause is bounded by
// the schema, not by what was sent. Objects are capped too: no Fieldfold object has near MAX_OBJECT_KEYS fields,
// and each unknown key would be one more error to build.

export const MAX_OBJECT_KEYS = 100;

interface MaxTest {
  OPTIONS?: { name?: string; params?: { max?: unknown }; message?: unknown };
}
interface SchemaNode {
  type?: string;
  fields?: Record<string, SchemaNode>;
  innerType?: SchemaNode;
  tests?: MaxTest[];
  resolve?: (options: { value: unknown; parent: unknown; context: object }) => SchemaNode;
}

function listCap(schema: SchemaNode): { max: number; message: string } | null {
  const test = schema.tests?.find((t) => t.OPTIONS?.name === 'max');
  const max = test?.OPTIONS?.params?.max;
  if (typeof max !== 'number') return null;
  const message = test?.OPTIONS?.message;
  return { max, message: typeof message === 'string' ? message : `At most ${max} items` };
}

const isRecord = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === 'object' && !Array.isArray(v);

/** `{ path: message }` for each list longer than its schema allows and each object with too many keys, or null. */
export function listCapProblems(schema: AnySchema, value: unknown): FieldErrors | null {
  const problems: FieldErrors = Object.create(null);
  let found = 0;
  const stack: Array<{ schema: SchemaNode; value: unknown; parent: unknown; path: string }> = [{ schema: schema as unknown as SchemaNode, value, parent: undefined, path: '' }];
  while (stack.length > 0 && found < 20) {
    const node = stack.pop()!;
    // Lazy schemas and `when` conditions pick their schema from the value and its siblings, as yup would.
    const s = node.schema.resolve ? node.schema.resolve({ value: node.value, parent: node.parent, context: {} }) : node.schema;
    if (Array.isArray(node.value)) {
      if (s.type !== 'array') continue;
      const cap = listCap(s);
      if (cap && node.value.length > cap.max) {
        problems[node.path || '_'] = cap.message;
        found += 1;
      } else if (s.innerType) {
        const list = node.value;
        for (let i = 0; i < list.length; i++) stack.push({ schema: s.innerType, value: list[i], parent: list, path: `${node.path}[${i}]` });
      }
    } else if (isRecord(node.value)) {
      if (Object.keys(node.value).length > MAX_OBJECT_KEYS) {
        problems[node.path || '_'] = `At most ${MAX_OBJECT_KEYS} fields`;
        found += 1;
        continue;
      }
      if (s.type !== 'object' || !s.fields) continue;
      for (const key of Object.keys(s.fields)) {
        if (Object.prototype.hasOwnProperty.call(node.value, key)) stack.push({ schema: s.fields[key], value: node.value[key], parent: node.value, path: node.path ? `${node.path}.${key}` : key });
      }
    }
  }
  return found > 0 ? problems : null;
}
