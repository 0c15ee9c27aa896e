import { z } from 'zod';

// Shared by the forms in the browser and the route handlers.
export const emailField = z.email('Enter an e-mail address such as name@firm.com.').max(254, 'E-mail addresses are at most 254 characters.').transform((s) => s.toLowerCase());
/** bcrypt reads only the first 72 bytes of a password; longer ones are refused rather than silently cut. */
export const PASSWORD_MAX_BYTES = 72;
export const utf8Length = (s: string): number => new TextEncoder().encode(s).length;
export const PASSWORD_RULE = 'At least 10 characters and at most 72 bytes: 72 plain letters, fewer with accented letters, symbols or emoji (they take 2 to 4 bytes each).';
export const passwordField = z
  .string()
  .min(10, 'Use at least 10 characters.')
  .refine((s) => utf8Length(s) <= PASSWORD_MAX_BYTES, 'Use at most 72 bytes: 72 plain letters, fewer with accented letters, symbols or emoji (they take 2 to 4 bytes each).');
export const nameField = z.string().trim().min(1, 'Enter a name.').max(120, 'Use at most 120 characters.');

export const signUpSchema = z.object({
  firmName: z.string().trim().min(2, 'Enter your firm’s name (at least 2 characters).').max(120, 'Use at most 120 characters.'),
  name: nameField,
  email: emailField,
  password: passwordField,
});

const tokenField = z.string().min(20, 'This link is incomplete: open the whole link from the e-mail.').max(200, 'This link is not one of ours.');

export const confirmSignUpSchema = z.object({ token: tokenField, password: z.string().min(1, 'Enter the password you chose when signing up.').max(200) });

export const passwordResetRequestSchema = z.object({ email: emailField });

export const resetPasswordSchema = z.object({ token: tokenField, password: passwordField });

export const changePasswordSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password.').max(200),
  newPassword: passwordField,
});

export const inviteSchema = z.object({
  email: emailField,
  role: z.enum(['author', 'checker'], { message: 'Choose author or checker.' }),
});

export const roleChangeSchema = z.object({ role: z.enum(['owner', 'author', 'checker'], { message: 'Choose owner, author or checker.' }) });

export const acceptInvitationSchema = z.object({
  token: z.string().min(20).max(200),
  name: nameField.optional(),
  password: z.string().min(1, 'Enter a password.').max(200),
});

export const settingsSchema = z
  .object({
    name: z.string().trim().min(2, 'Enter the firm’s name (at least 2 characters).').max(120),
    unitsDefault: z.enum(['mm', 'um', 'in'], { message: 'Choose mm, µm or in.' }),
    currencyDefault: z.string().regex(/^[A-Z]{3}$/, 'Use a three-letter ISO 4217 code such as EUR, GBP or USD.'),
    brandColor: z.string().regex(/^#[0-9a-fA-F]{6}$/, 'Use a colour such as #1f887b.').transform((s) => s.toLowerCase()),
    requireCheck: z.boolean(),
    paperSize: z.enum(['A4', 'Letter'], { message: 'Choose A4 or Letter.' }),
  })
  .partial()
  .strict();
