import type { z } from 'zod';

/** Turns zod issues into `{ field, message }` pairs and one readable sentence. */
export function describeZodError(error: z.ZodError, where: string): { message: string; details: { field: string; message: string }[] } {
  const details = error.issues.map((issue) => {
    const field = issue.path.length ? issue.path.join('.') : where;
    let message = issue.message;
    if (issue.code === 'unrecognized_keys') {
      message = `Unknown field${issue.keys.length > 1 ? 's' : ''} ${issue.keys.map((k) => `"${k}"`).join(', ')}: remove ${issue.keys.length > 1 ? 'them' : 'it'}.`;
    }
    return { field: issue.code === 'unrecognized_keys' ? issue.keys.join(',') : field, message };
  });
  const message = details.map((d) => (d.message.includes(d.field) ? d.message : `${d.field}: ${d.message}`)).join('; ');
  return { message, details };
}
