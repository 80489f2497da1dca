import * as yup from 'yup';
import { SIGNUP_ROLES } from '../roles';
import { oneLine } from './fields';
import { rejectUnknown } from './reject-unknown';

// One schema per request body, shared by the app's forms (Formik `validationSchema`) and the server's
// `validate()` middleware. Numbers are strict so a string "12" is refused instead of silently coerced.

export const PASSWORD_MIN_LENGTH = 10;
/** bcrypt reads only the first 72 bytes of a password and silently drops the rest, so a longer one is refused. */
export const PASSWORD_MAX_BYTES = 72;
export const PASSWORD_TOO_LONG = `Password must be at most ${PASSWORD_MAX_BYTES} bytes: ${PASSWORD_MAX_BYTES} plain letters, fewer with accents or emoji`;

/** Length of `text` in UTF-8 bytes, as bcrypt sees it (a lone surrogate counts as U+FFFD, 3 bytes). */
export function utf8Length(text: string): number {
  let bytes = 0;
  for (const ch of text) {
    const cp = ch.codePointAt(0)!;
    bytes += cp < 0x80 ? 1 : cp < 0x800 ? 2 : cp < 0x10000 ? 3 : 4;
  }
  return bytes;
}

/** A new password (sign-up, reset): long enough to resist guessing, short enough that bcrypt reads all of it. */
export const newPassword = () =>
  yup
    .string()
    .strict()
    .min(PASSWORD_MIN_LENGTH, `Password must be at least ${PASSWORD_MIN_LENGTH} characters`)
    .test('bcrypt-bytes', PASSWORD_TOO_LONG, (v) => v == null || utf8Length(v) <= PASSWORD_MAX_BYTES)
    .required('Password is required');

// The address goes into a To header: it must be one line whatever yup's email pattern allows.
const email = oneLine(
  yup
    .string()
    .strict()
    .trim('Email must not start or end with spaces')
    .lowercase('Email must be in lower case')
    .email('Email must be a valid address, like name@example.com')
    .max(254, 'Email is too long')
    .required('Email is required'),
  'Email',
);

/** A person's name as they sign up or edit it: it is shown to the other party and goes into mail. */
const personName = () =>
  oneLine(yup.string().strict().trim('Name must not start or end with spaces').min(2, 'Name is too short').max(120, 'Name is too long'), 'Name');

export const registerSchema = rejectUnknown(
  yup.object({
    email,
    password: newPassword(),
    name: personName().required('Name is required'),
    roles: yup
      .array(
        yup
          .string()
          .strict()
          .oneOf([...SIGNUP_ROLES], 'Role must be grower or grazier')
          .required('Role is required'),
      )
      .strict()
      .min(1, 'Choose at least one role: grower or grazier')
      .max(SIGNUP_ROLES.length, 'Choose grower, grazier or both')
      .required('Choose at least one role: grower or grazier'),
  }),
);

export type RegisterInput = yup.InferType<typeof registerSchema>;

export const loginSchema = rejectUnknown(
  yup.object({
    email: oneLine(yup.string().strict().email('Email must be a valid address, like name@example.com').required('Email is required'), 'Email'),
    password: yup.string().strict().required('Password is required'),
  }),
);

export type LoginInput = yup.InferType<typeof loginSchema>;

// ——— password reset by mail (POST /api/auth/password-reset, …/confirm) ———

/** How long a mailed reset link works. */
export const PASSWORD_RESET_TTL_MS = 30 * 60_000;

export const passwordResetRequestSchema = rejectUnknown(
  yup.object({
    email: oneLine(
      yup.string().strict().trim('Email must not start or end with spaces').email('Email must be a valid address, like name@example.com').max(254, 'Email is too long').required('Email is required'),
      'Email',
    ),
  }),
);

export type PasswordResetRequest = yup.InferType<typeof passwordResetRequestSchema>;

export const passwordResetConfirmSchema = rejectUnknown(
  yup.object({
    // 32 random bytes, base64url (43 characters), as the mailed link carries it.
    token: yup
      .string()
      .strict()
      .matches(/^[A-Za-z0-9_-]{43}$/, 'This reset link is not complete: open it from the mail again, or ask for a new one')
      .required('This page needs the link from the mail: open it from the mail again, or ask for a new one'),
    password: newPassword(),
  }),
);

export type PasswordResetConfirm = yup.InferType<typeof passwordResetConfirmSchema>;

export const FLOCK_SPECIES = ['sheep', 'goats', 'mixed'] as const;
export const FLOCK_CLASSES = ['dry ewes', 'ewes with lambs', 'weaned lambs', 'wethers', 'does', 'does with kids', 'mixed'] as const;

const optionalText = (label: string, max: number) =>
  oneLine(yup.string().strict().trim(`${label} must not start or end with spaces`).max(max, `${label} is too long`).nullable(), label);

export const flockSchema = rejectUnknown(
  yup.object({
    species: yup.string().strict().oneOf([...FLOCK_SPECIES], 'Species must be sheep, goats or mixed').required('Species is required'),
    animalClass: yup.string().strict().oneOf([...FLOCK_CLASSES], 'Class is not one we know').required('Class is required'),
    headCount: yup.number().strict().integer('Head count must be a whole number').min(1, 'Head count must be at least 1').max(20000, 'Head count must be at most 20 000').required('Head count is required'),
    bodyWeightLb: yup.number().strict().min(10, 'Typical body weight must be at least 10 lb').max(400, 'Typical body weight must be at most 400 lb').required('Typical body weight is required'),
  }),
);

export const profileSchema = rejectUnknown(
  yup.object({
    name: personName(),
    businessName: optionalText('Business name', 120),
    phone: oneLine(
      yup
        .string()
        .strict()
        .matches(/^\+?[0-9 ()-]{7,20}$/, { message: 'Phone must be digits, spaces, brackets or dashes (7–20)', excludeEmptyString: true })
        .nullable(),
      'Phone',
    ),
    homePlace: optionalText('Home base', 120),
    homeLatitude: yup.number().strict().min(-90, 'Latitude must be between -90 and 90').max(90, 'Latitude must be between -90 and 90').nullable(),
    homeLongitude: yup.number().strict().min(-180, 'Longitude must be between -180 and 180').max(180, 'Longitude must be between -180 and 180').nullable(),
    flock: flockSchema.nullable().optional().default(undefined),
    activeRole: yup.string().strict().oneOf([...SIGNUP_ROLES], 'Active role must be grower or grazier'),
  }),
).test('home-base-pair', 'Give both latitude and longitude, or neither', function (value) {
    if (!value) return true;
    const hasLat = value.homeLatitude != null;
    const hasLng = value.homeLongitude != null;
    if (hasLat === hasLng) return true;
    return this.createError({ path: hasLat ? 'homeLongitude' : 'homeLatitude', message: 'Give both latitude and longitude, or neither' });
  });

export type ProfileInput = yup.InferType<typeof profileSchema>;
export type FlockInput = yup.InferType<typeof flockSchema>;

/** What the API returns for a signed-in account (never the password hash). */
export interface AccountView {
  id: string;
  email: string;
  name: string;
  roles: Array<'grower' | 'grazier' | 'admin'>;
  activeRole: 'grower' | 'grazier' | null;
  businessName: string | null;
  phone: string | null;
  homePlace: string | null;
  homeLatitude: number | null;
  homeLongitude: number | null;
  flock: FlockInput | null;
  createdAt: string;
}
