// What the app answers about an attached file: a module with no server imports, so that client components
// (components/data/api-client.ts) parse responses with the same schema the OpenAPI document shows.
import { z } from 'zod';
import { attachmentRefSchema } from '@/lib/sheets/content';

const tableSummarySchema = z.object({
  name: z.string().meta({ description: 'The name cells use: `name.column`.' }),
  rows: z.number().int(),
  columns: z.array(z.object({ name: z.string(), unit: z.string().nullable() })),
});

export const attachmentSchema = attachmentRefSchema.extend({
  uploadedBy: z.string(),
  uploadedAt: z.string().meta({ description: 'ISO 8601 UTC time.' }),
  table: tableSummarySchema.nullable().meta({ description: 'For a CSV data table: how cells refer to it.' }),
});
export type AttachmentInfo = z.infer<typeof attachmentSchema>;
