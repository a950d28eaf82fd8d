import { z } from 'zod';

/** A page of a list walked by cursor: give `nextCursor` back as `cursor`; null on the last page. */
export const pageOf = <T extends z.ZodType>(item: T) =>
  z.object({ items: z.array(item), nextCursor: z.string().nullable() });
