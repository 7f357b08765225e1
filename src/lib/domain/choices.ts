// A fixed list of values with the words shown for each, declared once as `value: label` in display
// order. It gives the values in that order (a tuple, for z.enum and for menus), the labels, a type
// guard, and subsets that keep the labels; the value type stays a union of literals:
// `Choice<typeof MAST_STATUS>`.

export type ChoiceValues = readonly [string, ...string[]];

export interface Choices<V extends ChoiceValues> {
  /** The values in display order. */
  readonly values: V;
  /** The words shown for each value. */
  readonly labels: Readonly<Record<V[number], string>>;
  /** Whether a value (e.g. a query parameter) is one of the list. */
  is(value: unknown): value is V[number];
  /** Some of the values, in the order given, with the same labels. */
  pick<const S extends readonly [V[number], ...V[number][]]>(subset: S): Choices<S>;
}

/** The value type of a list: `Choice<typeof PLAN_STATE>` is `'enquiry' | 'planned' | …`. */
export type Choice<C extends { readonly values: ChoiceValues }> = C['values'][number];

/** The list from its labels: the values are the keys, in the order written. */
export function defineChoices<const L extends Readonly<Record<string, string>>>(labels: L): Choices<readonly [keyof L & string, ...(keyof L & string)[]]> {
  const values = Object.keys(labels) as unknown as readonly [keyof L & string, ...(keyof L & string)[]];
  if (values.length === 0) throw new Error('A list of choices needs at least one value');
  return choicesOf(values, labels);
}

function choicesOf<const V extends ChoiceValues>(values: V, labels: Readonly<Record<V[number], string>>): Choices<V> {
  const known = new Set<string>(values);
  return {
    values,
    labels,
    is: (value: unknown): value is V[number] => typeof value === 'string' && known.has(value),
    pick: <const S extends readonly [V[number], ...V[number][]]>(subset: S) =>
      choicesOf(subset, Object.fromEntries(subset.map((v) => [v, labels[v as V[number]]])) as Record<S[number], string>),
  };
}
