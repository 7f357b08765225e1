import { describe, expect, expectTypeOf, it } from 'vitest';
import { z } from 'zod';
import { defineChoices, type Choice } from '../../src/lib/domain/choices';

const SIZE = defineChoices({ small: 'Small', medium: 'Medium', large: 'Large' });
type Size = Choice<typeof SIZE>;

describe('defineChoices', () => {
  it('keeps the values in the order given, with their labels', () => {
    expect(SIZE.values).toEqual(['small', 'medium', 'large']);
    expect(SIZE.values.map((v) => SIZE.labels[v])).toEqual(['Small', 'Medium', 'Large']);
  });

  it('gives a union of literals and a tuple z.enum accepts', () => {
    expectTypeOf<Size>().toEqualTypeOf<'small' | 'medium' | 'large'>();
    const schema = z.enum(SIZE.values);
    expectTypeOf<z.infer<typeof schema>>().toEqualTypeOf<Size>();
    expect(schema.safeParse('medium').success).toBe(true);
    expect(schema.safeParse('huge').success).toBe(false);
  });

  it('refuses a list without values', () => {
    expect(() => defineChoices({})).toThrow(/at least one value/);
  });

  it('tells values of the list from anything else', () => {
    expect(SIZE.is('large')).toBe(true);
    for (const other of ['Large', '', 'huge', null, undefined, 3, ['small']]) expect(SIZE.is(other)).toBe(false);
  });

  it('picks a subset in its own order, with the same labels', () => {
    const ends = SIZE.pick(['large', 'small']);
    expectTypeOf<Choice<typeof ends>>().toEqualTypeOf<'large' | 'small'>();
    expect(ends.values).toEqual(['large', 'small']);
    expect(ends.labels).toEqual({ large: 'Large', small: 'Small' });
    expect(ends.is('medium')).toBe(false);
  });
});
