import '../model/zod-config';
import { z } from 'zod';
import { PIXELS_PER_CLOCK } from '../drive/interface';
import { STANDARDS } from '../drive/resolve';
import { nameSchema } from './text.schema';

const whole = (name: string, min: number, max: number) =>
  z
    .number({ message: `${name} must be a whole number from ${min} to ${max}` })
    .int({ message: `${name} must be a whole number from ${min} to ${max}` })
    .min(min, { message: `${name} must be a whole number from ${min} to ${max}` })
    .max(max, { message: `${name} must be a whole number from ${min} to ${max}` });

const axisSchema = (unit: string) =>
  z.strictObject({
    active: whole(`active ${unit}`, 1, 8192),
    frontPorch: whole(`front porch ${unit}`, 0, 4096),
    sync: whole(`sync ${unit}`, 1, 4096),
    backPorch: whole(`back porch ${unit}`, 0, 4096),
  });

/** Where a saved timing comes from: a standard mode, or every figure given by hand. */
export const timingSourceSchema = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('standard'),
    standard: z.enum(STANDARDS, { message: `standard must be one of ${STANDARDS.join(', ')}` }),
    mode: z.string().regex(/^(\d{2,5}x\d{2,5}@\d{1,3}(\.\d+)?( RB)?|vga-mode-03h|vga-mode-12h)$/, {
      message: 'mode must look like 640x480@60 (or 1280x768@60 RB for a reduced-blanking DMT row)',
    }),
  }),
  z.strictObject({
    kind: z.literal('custom'),
    pixelClockMHz: z
      .number({ message: 'pixel clock must be a number from 0.1 to 1000 MHz' })
      .min(0.1, { message: 'pixel clock must be a number from 0.1 to 1000 MHz' })
      .max(1000, { message: 'pixel clock must be a number from 0.1 to 1000 MHz' }),
    h: axisSchema('pixels'),
    v: axisSchema('lines'),
    hSyncPositive: z.boolean(),
    vSyncPositive: z.boolean(),
  }),
]);
export type TimingSource = z.infer<typeof timingSourceSchema>;

export const interfaceSchema = z.strictObject({
  dualScan: z.boolean(),
  pixelsPerClock: z.union(
    PIXELS_PER_CLOCK.map((n) => z.literal(n)) as unknown as [z.ZodLiteral<1>, z.ZodLiteral<4>, z.ZodLiteral<8>, z.ZodLiteral<16>],
    { message: `pixels per clock must be one of ${PIXELS_PER_CLOCK.join(', ')}` },
  ),
});

export const createTimingSchema = z.strictObject({
  name: nameSchema(80),
  panelTypeId: z.string().max(100),
  source: timingSourceSchema,
  interface: interfaceSchema,
});
export type CreateTimingBody = z.infer<typeof createTimingSchema>;

export const updateTimingSchema = createTimingSchema.partial();

/** The timing list's query string: optionally one panel type's timings. */
export const timingListQuerySchema = z.object({ panelTypeId: z.string({ message: 'give one panelTypeId' }).max(80).optional() });
