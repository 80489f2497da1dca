// Fieldfold's visual tokens, in one place. Screens and components read these; none hard-codes a colour.
// The palette is drawn from a winter orchard floor: loam, cover-crop green, dry straw, clay.
import { withFallback } from './font-family';

export const colors = {
  ink: '#1E2822',
  inkMuted: '#55625A',
  inkFaint: '#7D877F',
  paper: '#F5F1E6',
  surface: '#FFFDF8',
  surfaceSunk: '#ECE6D6',
  line: '#D9CFB9',
  lineStrong: '#B9AD93',
  cover: '#3E6B4E', // primary: cover-crop green
  coverDeep: '#28442F',
  coverWash: '#E2ECDF',
  onCover: '#FFFFFF',
  clay: '#A8512B', // accent
  clayWash: '#F6E3D6',
  caution: '#7A4A0B',
  cautionWash: '#FBEFCF',
  cautionLine: '#E0B85C',
  danger: '#9E2A2B',
  dangerWash: '#F8E0DE',
  ok: '#2D6A45',
  sky: '#2C5A73',
  skyWash: '#DEEAF0',
  focus: '#C98A1B',
} as const;

export const space = { xxs: 2, xs: 4, sm: 8, md: 12, lg: 16, xl: 24, xxl: 32, xxxl: 48 } as const;

export const radius = { sm: 6, md: 10, lg: 16, pill: 999 } as const;

export const fonts = {
  body: withFallback('PublicSans_400Regular', 'sans'),
  bodyStrong: withFallback('PublicSans_600SemiBold', 'sans'),
  bodyBold: withFallback('PublicSans_700Bold', 'sans'),
  display: withFallback('Bitter_700Bold', 'slab'),
  heading: withFallback('Bitter_600SemiBold', 'slab'),
  /** Fingerprints and ids: the system's monospace (nothing to ship; only hex digits use it). */
  mono: 'monospace',
};

/** Type scale: size / line height in px. Display and headings in the slab serif, the rest in the sans. */
export const type = {
  display: { fontFamily: fonts.display, fontSize: 30, lineHeight: 36 },
  title: { fontFamily: fonts.heading, fontSize: 22, lineHeight: 28 },
  heading: { fontFamily: fonts.heading, fontSize: 18, lineHeight: 24 },
  body: { fontFamily: fonts.body, fontSize: 16, lineHeight: 23 },
  bodyStrong: { fontFamily: fonts.bodyStrong, fontSize: 16, lineHeight: 23 },
  label: { fontFamily: fonts.bodyStrong, fontSize: 14, lineHeight: 19 },
  caption: { fontFamily: fonts.body, fontSize: 13, lineHeight: 18 },
  figure: { fontFamily: fonts.bodyBold, fontSize: 24, lineHeight: 30 },
} as const;

export type TypeVariant = keyof typeof type;

/** Widths at which the layout changes: one column below `wide`; side navigation and two panes from it. */
export const breakpoints = { wide: 1024, medium: 700 } as const;

export const contentMaxWidth = 1120;
