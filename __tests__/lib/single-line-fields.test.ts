import { ValidationError } from 'yup';
import { isSingleLine, line, paragraphs } from '../../lib/schemas/fields';
import { registerSchema, profileSchema } from '../../lib/schemas/account';
import { blockInputSchema } from '../../lib/schemas/block';
import { cancelContractSchema, signContractSchema } from '../../lib/schemas/contract';

// Every character class a single-line field must refuse, by name, so a failure says which one slipped through.
const REFUSED: Array<[string, string]> = [
  ['NUL U+0000', '\u0000'],
  ['TAB U+0009', '\t'],
  ['LF U+000A', '\n'],
  ['CR U+000D', '\r'],
  ['ESC U+001B', '\u001b'],
  ['unit separator U+001F', '\u001f'],
  ['DEL U+007F', '\u007f'],
  ['C1 U+0080', '\u0080'],
  ['NEL U+0085', '\u0085'],
  ['C1 U+009F', '\u009f'],
  ['line separator U+2028', '\u2028'],
  ['paragraph separator U+2029', '\u2029'],
];

async function messageOf(schema: { validate: (v: unknown, o: object) => Promise<unknown> }, value: unknown): Promise<string | null> {
  try {
    await schema.validate(value, { abortEarly: false, stripUnknown: false });
    return null;
  } catch (err) {
    if (!(err instanceof ValidationError)) throw err;
    return err.errors.join('; ');
  }
}

describe('single-line text (lib/schemas/fields line)', () => {
  const name = line('Name', 120);

  it.each(REFUSED)('When a name holds %s, then it is refused with a message naming the field', async (_what, ch) => {
    expect(isSingleLine(`Olsen${ch}Orchard`)).toBe(false);
    expect(await messageOf(name, `Olsen${ch}Orchard`)).toBe('Name must be on one line, without line breaks, tabs or other control characters');
  });

  it('When a name has accents, a no-break space, an apostrophe or an emoji, then it is accepted', async () => {
    for (const ok of ['Ólafsdóttir Vineyard', 'Haas\u00a0Brush Goats', "O'Neill & Sons", 'Goats 🐐 for hire', 'Kellner — Range']) {
      expect(isSingleLine(ok)).toBe(true);
      expect(await messageOf(name, ok)).toBeNull();
    }
  });
});

describe('multi-line text (lib/schemas/fields paragraphs)', () => {
  const notes = paragraphs('Notes', 2000);

  it('When notes hold line breaks, then they are kept', async () => {
    expect(await messageOf(notes, 'Gate code at the office.\nWater trough by the pump.\n\nCall first.')).toBeNull();
  });

  it.each(REFUSED.filter(([what]) => !what.startsWith('LF')))('When notes hold %s, then they are refused', async (_what, ch) => {
    expect(await messageOf(notes, `Gate${ch}code`)).toBe('Notes may hold line breaks, but no tabs or other control characters');
  });
});

describe('the shared schemas use it', () => {
  it('When a sign-up name carries a header after CR LF, then registerSchema refuses the name', async () => {
    const body = { email: 'ana@test.example', password: 'a-good-password', name: 'Ana Field\r\nBcc: x@y.example', roles: ['grower'] };
    expect(await messageOf(registerSchema, body)).toBe('Name must be on one line, without line breaks, tabs or other control characters');
  });

  it('When a profile business name, place or phone holds a line break, then each is refused by name', async () => {
    const msg = await messageOf(profileSchema, { businessName: 'Haas\nGoats', homePlace: 'Pine\u2028Hollow', phone: '530 555\n0199' });
    expect(msg).toMatch(/Business name must be on one line/);
    expect(msg).toMatch(/Home base must be on one line/);
    expect(msg).toMatch(/Phone must/);
  });

  it('When a block name, place or spray product holds a control character, then each is refused; notes keep their line breaks', async () => {
    const block = {
      name: 'North\tbench',
      crop: 'orchard',
      acres: 80,
      placeName: 'Calder\u0085Valley',
      latitude: 39.72,
      longitude: -121.93,
      forageMethod: 'direct',
      lbDmPerAcre: 2000,
      targetUtilizationPct: 45,
      windowStart: '2027-01-04',
      windowEnd: '2027-03-05',
      outBy: '2027-03-01',
      sprayRecords: [{ product: 'Copper\r\nhydroxide', appliedOn: '2026-11-01', grazingRestrictionDays: 14, containsCopper: true }],
      waterOnSite: true,
      perimeterFence: 'full',
      truckAccess: true,
      speciesAllowed: ['goats'],
      youngPlantings: false,
      notes: 'Gate code at the office.\nCall first.',
    };
    const msg = await messageOf(blockInputSchema, block);
    expect(msg).toMatch(/Name must be on one line/);
    expect(msg).toMatch(/Place must be on one line/);
    expect(msg).toMatch(/Product must be on one line/);
    expect(msg).not.toMatch(/Notes/);
  });

  it('When a signature\'s typed name holds a line break, then it is refused; a cancel reason may hold line breaks but no tab', async () => {
    const sign = await messageOf(signContractSchema, { typedName: 'Greta Olsen\r\nBcc: x@y.example', termsHash: 'a'.repeat(64) });
    expect(sign).toMatch(/Your full name must be on one line/);
    expect(await messageOf(cancelContractSchema, { reason: 'Flood on the lower block.\nRoad closed.' })).toBeNull();
    expect(await messageOf(cancelContractSchema, { reason: 'Flood\ton the lower block.' })).toBe('Reason may hold line breaks, but no tabs or other control characters');
  });
});
