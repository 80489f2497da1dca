import * as yup from 'yup';
import * as account from '../../lib/schemas/account';
import * as bid from '../../lib/schemas/bid';
import * as block from '../../lib/schemas/block';
import * as calc from '../../lib/schemas/calc';
import * as contract from '../../lib/schemas/contract';
import * as invoice from '../../lib/schemas/invoice';

// The server refuses a list longer than its schema's cap before yup checks a single item (server/lib/http/list-caps.ts),
// which bounds the work one request can cause — but only for lists that declare a cap. Every list in every schema
// lib exports must have one, so a new list without `.max()` fails here rather than in production.

type Node = { type?: string; fields?: Record<string, Node>; innerType?: Node; tests?: Array<{ OPTIONS?: { name?: string } }>; resolve?: (o: object) => Node };

function uncappedLists(schema: Node, path: string, seen = new Set<Node>()): string[] {
  const s = schema.resolve ? schema.resolve({ value: {}, parent: {}, context: {} }) : schema;
  if (seen.has(s)) return [];
  seen.add(s);
  if (s.type === 'array') {
    const own = s.tests?.some((t) => t.OPTIONS?.name === 'max') ? [] : [path];
    return [...own, ...(s.innerType ? uncappedLists(s.innerType, `${path}[]`, seen) : [])];
  }
  if (s.type === 'object' && s.fields) return Object.entries(s.fields).flatMap(([k, f]) => uncappedLists(f, path ? `${path}.${k}` : k, seen));
  return [];
}

const schemas = Object.entries({ ...account, ...bid, ...block, ...calc, ...contract, ...invoice }).filter(([, v]) => yup.isSchema(v)) as Array<[string, Node]>;

describe('Every list a schema accepts has a cap', () => {
  it('finds the schemas', () => {
    expect(schemas.map(([name]) => name)).toEqual(expect.arrayContaining(['registerSchema', 'blockInputSchema', 'bidInputSchema', 'headDaysRequestSchema', 'forageRequestSchema']));
  });

  it.each(schemas)('%s', (_name, schema) => {
    expect(uncappedLists(schema, '')).toEqual([]);
  });
});
