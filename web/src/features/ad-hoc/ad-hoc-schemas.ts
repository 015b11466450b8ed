import { z } from 'zod';

/**
 * What the ad hoc comparison accepts. Inputs arrive as text from the form; these schemas say in
 * plain words what is wrong with each one. Degenerate but valid input (zero cases, a zero cell) is
 * accepted: the statistics core reports what it cannot compute and why.
 */
const numberText = (what: string) =>
  z
    .string()
    .trim()
    .min(1, `Enter ${what}.`)
    .transform((s) => s.replace(/[\s,_]/g, ''))
    .pipe(z.string().regex(/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i, `${what[0]!.toUpperCase()}${what.slice(1)} must be a number.`))
    .transform(Number);

const count = (what: string) =>
  numberText(what).pipe(
    z
      .number()
      .min(0, `${capital(what)} cannot be negative.`)
      .int(`${capital(what)} must be a whole number.`)
      .max(1e9, `${capital(what)} is implausibly large.`),
  );

const personTime = (what: string) =>
  numberText(what).pipe(
    z
      .number()
      .min(0, `${capital(what)} cannot be negative.`)
      .max(1e12, `${capital(what)} is implausibly large.`),
  );

function capital(s: string): string {
  return s[0]!.toUpperCase() + s.slice(1);
}

export const confidenceChoices = ['0.9', '0.95', '0.99'] as const;

export const rateInputSchema = z.object({
  exposed: z.object({ cases: count('the exposed cases'), personTime: personTime('the exposed person-time') }),
  reference: z.object({ cases: count('the reference cases'), personTime: personTime('the reference person-time') }),
});
export type RateInputText = z.input<typeof rateInputSchema>;
export type RateInput = z.output<typeof rateInputSchema>;

/** The 2×2 table by meaning: exposure in rows, the outcome in columns, never letters. */
export const tableInputSchema = z
  .object({
    exposedWith: count('the number exposed, with the outcome'),
    exposedWithout: count('the number exposed, without the outcome'),
    unexposedWith: count('the number not exposed, with the outcome'),
    unexposedWithout: count('the number not exposed, without the outcome'),
  })
  .superRefine((t, ctx) => {
    if (t.exposedWith + t.exposedWithout === 0)
      ctx.addIssue({ code: 'custom', path: ['exposedWithout'], message: 'The exposed group is empty: enter at least one person.' });
    if (t.unexposedWith + t.unexposedWithout === 0)
      ctx.addIssue({ code: 'custom', path: ['unexposedWithout'], message: 'The group not exposed is empty: enter at least one person.' });
  });
export type TableInputText = z.input<typeof tableInputSchema>;
export type TableInput = z.output<typeof tableInputSchema>;
