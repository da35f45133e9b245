import { z } from 'zod'
import { MAX_LATENCY_MS } from '../utils/grade'
import { Id } from './auth'

// Frame intervals a real display can have: 250 Hz (4 ms) down to 10 Hz (100 ms).
export const FRAME_INTERVAL_MIN_MS = 4
export const FRAME_INTERVAL_MAX_MS = 100
export const FRAMES_SHOWN_MAX = 1000
export const TYPED_MAX = 80

// practice: a short practice watch, asked for when nothing is due (product.md)
export const WatchBody = z.object({ deckId: Id.optional(), practice: z.boolean('Send practice as true or false.').optional() }).strict()

// `<sighting id>.webp`, the name of a sighting's picture under /images/s/ (same characters as Id).
export const SightingImageParam = z.object({
  file: z.string().regex(/^[\w-]{8,40}\.webp$/, 'Not an image name: use the address the watch gave you.'),
})

// One call. choiceId null (or no choiceId and no typed text with a null latency) is "no call within the window".
export const CallBody = z.object({
  choiceId: Id.nullable().optional(),
  typed: z.string().max(TYPED_MAX, `Use at most ${TYPED_MAX} characters.`).optional(),
  latencyMs: z.number('Give the latency in whole milliseconds.').int('Give the latency in whole milliseconds.')
    .min(0, 'A latency cannot be negative.').max(MAX_LATENCY_MS, `A latency above ${MAX_LATENCY_MS} ms is not a call.`).nullable(),
  framesShown: z.number('Give the frames shown as a whole number.').int('Give the frames shown as a whole number.')
    .min(0, 'Frames shown cannot be negative.').max(FRAMES_SHOWN_MAX, `At most ${FRAMES_SHOWN_MAX} frames.`),
  frameIntervalMs: z.number('Give the frame interval in milliseconds.')
    .min(FRAME_INTERVAL_MIN_MS, `A frame interval is at least ${FRAME_INTERVAL_MIN_MS} ms.`)
    .max(FRAME_INTERVAL_MAX_MS, `A frame interval is at most ${FRAME_INTERVAL_MAX_MS} ms.`),
  // epoch ms when the call was made (offline calls); the server bounds it
  calledAt: z.number().int('Give the call time in epoch milliseconds.').min(0).max(8.64e15).optional(),
}).strict().refine(b => !(b.choiceId && b.typed !== undefined), { message: 'Send a choice or typed text, not both.' })
  .refine(b => b.choiceId !== undefined || b.typed !== undefined || b.latencyMs === null, {
    message: 'Send the choice you called (choiceId), typed text, or choiceId null when no call was made.',
  })

export const BaselineBody = z.object({
  simpleMs: z.number('Give the simple reaction time in milliseconds.').min(100, 'A simple reaction time under 100 ms is an anticipation.').max(2000, 'A simple reaction time above 2 s is not a measurement.'),
  choiceMs: z.number('Give the choice reaction time in milliseconds.').min(100, 'A choice reaction time under 100 ms is an anticipation.').max(4000, 'A choice reaction time above 4 s is not a measurement.'),
  trials: z.number().int().min(4, 'Measure at least 4 trials.').max(200),
}).strict()

// A watch picture's address: its opaque id (nanoid, 21 characters) and .webp.
export const PictureFileParam = z.object({
  file: z.string().regex(/^[\w-]{21}\.webp$/, 'Not a picture name.'),
})

export type CallInput = z.infer<typeof CallBody>
export type BaselineInput = z.infer<typeof BaselineBody>
