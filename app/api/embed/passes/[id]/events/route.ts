import { z } from 'zod';
import { route, readJson, noContent } from '@/lib/server/http/handler';
import { fieldError } from '@/lib/server/http/errors';
import { requireViewer } from '@/lib/server/embed/access';
import { noteDial } from '@/lib/server/embed/events';
import { viewerDials } from '@/lib/core/embed/payload';

// A viewer moved a dial: counted for the pass's analytics. The value is checked against the dial's range.
const body = z
  .object({
    kind: z.literal('dial', { message: "Only 'dial' events are sent by the widget." }),
    dialId: z.string().min(1).max(64),
    value: z.number({ message: 'The dial value must be a finite number.' }).refine(Number.isFinite, 'The dial value must be a finite number.'),
  })
  .strict();

export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = await ctx.params;
  const v = await requireViewer(req, id);
  const input = await readJson(req, body);
  const dial = viewerDials(v.widget.model, v.widget.dialIds).find((d) => d.id === input.dialId);
  if (!dial) throw fieldError('dialId', `This widget has no dial '${input.dialId}' that viewers may move.`);
  // A relative tolerance of 1e-9 forgives decimal rounding in typed entries, nothing more.
  const tol = 1e-9 * Math.max(1, Math.abs(dial.min), Math.abs(dial.max));
  if (input.value < dial.min - tol || input.value > dial.max + tol) {
    throw fieldError('value', `The value ${input.value} is outside the dial's range (${dial.min} to ${dial.max}).`);
  }
  await noteDial(v.pass, dial.id);
  return noContent();
});
