import { z } from 'zod';

/** GET /api/dev/mail: messages caught by the local SMTP capture (dev only), newest first. */
export const DevMailMessageSchema = z.object({
  id: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  receivedAt: z.string(),
});
export type DevMailMessage = z.infer<typeof DevMailMessageSchema>;

export const DevMailListSchema = z.object({ messages: z.array(DevMailMessageSchema) });
export type DevMailList = z.infer<typeof DevMailListSchema>;
