import { z } from 'zod';
import { MAX_SEATS, MIN_SEATS } from './plan';

// Shared by the billing forms and the route handlers. No firm id is accepted from the browser: unknown keys are refused.
const seatsMessage = `Choose a whole number of seats from ${MIN_SEATS} to ${MAX_SEATS}.`;
export const seatsField = z
  .number({ message: seatsMessage })
  .int(seatsMessage)
  .min(MIN_SEATS, seatsMessage)
  .max(MAX_SEATS, seatsMessage);

export const checkoutSchema = z.strictObject({ seats: seatsField });
export const seatPreviewSchema = z.strictObject({ seats: seatsField });
export const seatChangeSchema = z.strictObject({
  seats: seatsField,
  prorationDate: z.number().int().positive().optional(),
  quote: z.string().min(10).max(200).optional(),
});
export const emptySchema = z.strictObject({});
