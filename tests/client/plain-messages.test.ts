// Schemas are shared by the endpoints and the forms: their messages are read by people.
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import '../../src/lib/schemas/params';

describe('plain messages for unworded checks', () => {
  it.each([
    [z.object({ name: z.string().max(120) }), { name: 'x'.repeat(121) }, 'At most 120 characters'],
    [z.object({ name: z.string().min(1) }), { name: '' }, 'Required'],
    [z.object({ name: z.string() }), {}, 'Required'],
    [z.object({ n: z.number() }), { n: 'x' }, 'Must be a number'],
    [z.object({ items: z.array(z.string()).max(2) }), { items: ['a', 'b', 'c'] }, 'At most 2 items'],
    [z.object({ email: z.string().email() }), { email: 'nope' }, 'Enter a valid e-mail address'],
  ])('%#', (schema, value, message) => {
    const result = schema.safeParse(value);
    expect(result.success).toBe(false);
    expect(result.error!.issues[0]!.message).toBe(message);
    expect(result.error!.issues[0]!.message).not.toMatch(/String must|character\(s\)|Expected/);
  });

  it('keeps a message the schema gives', () => {
    const r = z.string().max(3, 'Three at most').safeParse('abcd');
    expect(r.error!.issues[0]!.message).toBe('Three at most');
  });
});
