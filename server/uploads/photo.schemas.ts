import { z } from 'zod';

/** A photo of a valve as the API shows it. */
export const photoViewSchema = z.object({
  id: z.number().int(),
  valveId: z.number().int(),
  originalName: z.string().describe("The uploader's file name, for display"),
  mime: z.string(),
  bytes: z.number().int(),
  width: z.number().int().nullable().describe('px'),
  height: z.number().int().nullable().describe('px'),
  uploadedBy: z.string().nullable(),
  createdAt: z.string(),
  url: z.string().describe('GET this (signed in) for the image'),
  thumbUrl: z.string().describe('GET this (signed in) for a thumbnail of at most 320 px'),
});
