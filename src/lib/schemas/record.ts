// One declaration per record. Each field is named once, as it is stored and sent (snake_case), and
// says how it is written (its zod type on create, whether a change may set it), whether it is
// audited, and how it is read from a row and shown in JSON. Everything else is derived from that
// table: the body shapes of create and change, the camelCase value repos return, the insert and
// patch rows, the JSON answer and the audit view. Adding a field is one line here plus its migration.
import type { z } from 'zod';

/** `sector_azimuth_deg` → `sectorAzimuthDeg`, as a type. */
export type Camel<S extends string> = S extends `${infer H}_${infer T}` ? `${H}${Capitalize<Camel<T>>}` : S;

/** `sector_azimuth_deg` → `sectorAzimuthDeg`. */
export const camel = <S extends string>(name: S): Camel<S> => name.replace(/_([a-z0-9])/g, (_, c: string) => c.toUpperCase()) as Camel<S>;

export interface Field<T, J = T, I extends z.ZodTypeAny | undefined = z.ZodTypeAny | undefined, P extends boolean = boolean, S extends boolean = boolean> {
  /** The zod type of the value in a create body; undefined: the server sets the field. */
  readonly input: I;
  /** A change body may set it (as an optional field of the same type). */
  readonly patch: P;
  /** The generic insert and patch write it to its column (false: the repo writes it, e.g. a point). */
  readonly column: boolean;
  /** The generic insert writes it (every body field; a value the server derives when set). */
  readonly write: boolean;
  /** SQL reading the value instead of the column; `{t}` stands for the table alias. */
  readonly sql?: string;
  /** Listed in the audit view of the record. */
  readonly audit: boolean;
  /** Shown in the JSON answer (a literal, so that `JsonOf` leaves out a hidden field). */
  readonly json: S;
  readonly fromRow: (stored: unknown) => T;
  readonly toJson: (value: T) => J;
  /** How the insert and patch store the value (default: as it is; e.g. a table as JSON text). */
  readonly toRow?: (value: T) => unknown;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyField = Field<any, any, z.ZodTypeAny | undefined, boolean, boolean>;
export type Fields = Record<string, AnyField>;

type ValueType<F> = F extends Field<infer T, infer _J, infer _I, infer _P, infer _S> ? T : never;
type JsonType<F> = F extends Field<infer _T, infer J, infer _I, infer _P, infer _S> ? J : never;
type InputKeys<F extends Fields> = { [K in keyof F & string]: F[K]['input'] extends z.ZodTypeAny ? K : never }[keyof F & string];
type PatchKeys<F extends Fields> = { [K in InputKeys<F>]: F[K]['patch'] extends true ? K : never }[InputKeys<F>];
type InputSchema<F extends Fields, K extends keyof F> = F[K]['input'] extends z.ZodTypeAny ? F[K]['input'] : never;

/** The record as repos return it: camelCase keys, Dates, ids as strings. */
export type ValueOf<F extends Fields> = { [K in keyof F & string as Camel<K>]: ValueType<F[K]> };
/** The record as the API answers it. */
export type JsonOf<F extends Fields> = { [K in keyof F & string as F[K]['json'] extends false ? never : K]: JsonType<F[K]> };
/** A checked create body. */
export type InputOf<F extends Fields> = { [K in InputKeys<F> as Camel<K>]: z.output<InputSchema<F, K>> };
/** A checked change body: a field left out is undefined. */
export type ChangeOf<F extends Fields> = { [K in PatchKeys<F> as Camel<K>]: z.output<InputSchema<F, K>> | undefined };

interface Options<S extends boolean> {
  column?: boolean;
  write?: boolean;
  sql?: string;
  audit?: boolean;
  json?: S;
}

const asIs = <T>(v: unknown) => v as T;
const same = <T>(v: T) => v;

/** A field a client writes: on create with `schema`, in a change as the same type made optional. Audited. */
/** `fromRow` may give a narrower type than the body's (e.g. a band label the repo resolved). */
function input<I extends z.ZodTypeAny, T = z.output<I>, J = T, P extends boolean = true, S extends boolean = true>(
  schema: I,
  options: Options<S> & { patch?: P; fromRow?: (stored: unknown) => T; toJson?: (value: T) => J; toRow?: (value: T) => unknown } = {},
): NoInfer<Field<T, J, I, P, S>> {
  const { fromRow = asIs<T>, toJson = same as (value: T) => J, ...rest } = options;
  return { input: schema, patch: true as P, column: true, audit: true, json: true as S, write: true, ...rest, fromRow, toJson };
}

type ValueOptions<T, J> = Omit<Options<boolean>, 'json'> & {
  fromRow?: (stored: unknown) => T;
  toJson?: (value: T) => J;
  toRow?: (value: T) => unknown;
};

/** A field the server keeps (row version, derived values), read and shown as stored unless told otherwise. */
// Two signatures, so that `field.value<string>({ json: false })` keeps the literal `false` with T given by hand.
function value<T, J = T>(options: ValueOptions<T, J> & { json: false }): NoInfer<Field<T, J, undefined, false, false>>;
function value<T, J = T>(options?: ValueOptions<T, J> & { json?: true }): NoInfer<Field<T, J, undefined, false, true>>;
function value<T, J = T>(options: ValueOptions<T, J> & { json?: boolean } = {}): Field<T, J, undefined, false, boolean> {
  const { fromRow = asIs<T>, toJson = same as (value: T) => J, ...rest } = options;
  return { input: undefined, patch: false, column: true, audit: false, json: true, write: false, ...rest, fromRow, toJson };
}

function kept<T, J>(fromRow: (stored: unknown) => T, toJson: (value: T) => J) {
  return <S extends boolean = true>(options: Options<S> = {}): NoInfer<Field<T, J, undefined, false, S>> => ({
    input: undefined,
    patch: false,
    column: true,
    audit: false,
    json: true as S,
    write: false,
    ...options,
    fromRow,
    toJson,
  });
}

const toId = (v: unknown) => String(v);
const toIdOrNull = (v: unknown) => (v === null || v === undefined ? null : String(v));
const toNumberOrNull = (v: unknown) => (v === null || v === undefined ? null : Number(v));
const toDate = (v: unknown) => (v instanceof Date ? v : new Date(v as string));
const iso = (d: Date) => d.toISOString();
const isoOrNull = (d: Date | null) => (d ? d.toISOString() : null);

export const field = {
  input,
  value,
  /** A bigint id (PostgreSQL returns it as text), as a string. */
  id: kept<string, string>(toId, same),
  /** A nullable reference to another row, as a string. */
  ref: kept<string | null, string | null>(toIdOrNull, same),
  /** A count (PostgreSQL returns count(*) as text), as a number. */
  count: kept<number, number>((v) => Number(v), same),
  /** A bigint that fits a JavaScript number (e.g. a 36-bit cell identity). */
  bigNumber: kept<number | null, number | null>(toNumberOrNull, same),
  /** A timestamp: a Date in the value, ISO 8601 in JSON (and in a record read as JSON, `objectSql`). */
  time: kept<Date, string>(toDate, iso),
  /** A nullable timestamp. */
  maybeTime: kept<Date | null, string | null>((v) => (v === null || v === undefined ? null : toDate(v)), isoOrNull),
};

/** ISO 8601 in JSON for a written timestamp (`field.input(schema, { toJson: isoTime })`). */
export const isoTime = (d: Date | null | undefined) => (d ? d.toISOString() : null);
/** Absent or null as null (`schema.nullish().transform(orNull)`), so the value is `T | null`. */
export const orNull = <T>(v: T | null | undefined): T | null => v ?? null;
/** A bigint column read as a number (PostgreSQL returns bigints as text). */
export const numberOrNull = toNumberOrNull;
/** A nullable bigint id read as a string (`field.input(schema, { fromRow: idOrNull })`). */
export const idOrNull = toIdOrNull;

type Entry = { name: string; key: string; spec: AnyField };

export interface RecordDeclaration<F extends Fields> {
  readonly fields: F;
  /** zod shape of a create body. */
  readonly inputShape: { [K in InputKeys<F>]: InputSchema<F, K> };
  /** zod shape of a change body: every field optional. */
  readonly changeShape: { [K in PatchKeys<F>]: z.ZodOptional<InputSchema<F, K>> };
  /** A parsed create body (snake_case) as the value repos take. */
  toInput(body: Record<string, unknown>): InputOf<F>;
  /** A parsed change body (snake_case) as the value repos take. */
  toChange(body: Record<string, unknown>): ChangeOf<F>;
  /** Columns (and SQL expressions) to select, for `db.raw` or a select list. */
  columns(alias: string): { plain: string[]; sql: string[] };
  /** The same columns as one JSON object (`json_build_object`), to select a record inside another. */
  objectSql(alias: string): string;
  fromRow(row: Record<string, unknown>): ValueOf<F>;
  toJson(value: ValueOf<F>): JsonOf<F>;
  /** Columns written on insert, from a create value (and values the server derives); the repo writes what is not a plain column. */
  insertRow(input: Partial<Record<keyof ValueOf<F>, unknown>>): Record<string, unknown>;
  /** The written fields of a value as a create body (snake_case), to check a merged change again. */
  asBody(value: ValueOf<F>): Record<string, unknown>;
  /** Columns a change sets (fields left out are not touched). */
  patchRow(change: Partial<ChangeOf<F>>): Record<string, unknown>;
  /** The audited fields, snake_case as in JSON. */
  auditView(value: ValueOf<F>): Record<string, unknown>;
}

export function defineRecord<F extends Fields>(fields: F): RecordDeclaration<F> {
  const entries: Entry[] = Object.entries(fields).map(([name, spec]) => ({ name, key: camel(name), spec }));
  const inputs = entries.filter((e) => e.spec.input !== undefined);
  const patches = inputs.filter((e) => e.spec.patch);
  const written = entries.filter((e) => e.spec.column && e.spec.write);
  const pick = (list: Entry[], from: Record<string, unknown>, by: 'name' | 'key', to: 'name' | 'key') =>
    Object.fromEntries(list.map((e) => [e[to], from[e[by]]]));
  const stored = (e: Entry, v: unknown) => (e.spec.toRow && v !== undefined && v !== null ? e.spec.toRow(v) : v);
  return {
    fields,
    inputShape: Object.fromEntries(inputs.map((e) => [e.name, e.spec.input])) as RecordDeclaration<F>['inputShape'],
    changeShape: Object.fromEntries(patches.map((e) => [e.name, (e.spec.input as z.ZodTypeAny).optional()])) as RecordDeclaration<F>['changeShape'],
    toInput: (body) => pick(inputs, body, 'name', 'key') as InputOf<F>,
    toChange: (body) => pick(patches, body, 'name', 'key') as ChangeOf<F>,
    columns: (alias) => ({
      plain: entries.filter((e) => !e.spec.sql).map((e) => `${alias}.${e.name}`),
      sql: entries.filter((e) => e.spec.sql).map((e) => `${e.spec.sql!.replaceAll('{t}', alias)} AS ${e.name}`),
    }),
    objectSql: (alias) =>
      `json_build_object(${entries.map((e) => `'${e.name}', ${e.spec.sql ? e.spec.sql.replaceAll('{t}', alias) : `${alias}.${e.name}`}`).join(', ')})`,
    fromRow: (row) => Object.fromEntries(entries.map((e) => [e.key, e.spec.fromRow(row[e.name])])) as ValueOf<F>,
    toJson: (v) => {
      const values = v as Record<string, unknown>;
      return Object.fromEntries(entries.filter((e) => e.spec.json).map((e) => [e.name, e.spec.toJson(values[e.key])])) as JsonOf<F>;
    },
    insertRow: (input) => {
      const values = input as Record<string, unknown>;
      return Object.fromEntries(written.map((e) => [e.name, stored(e, values[e.key])]));
    },
    asBody: (v) => pick(inputs, v as Record<string, unknown>, 'key', 'name'),
    patchRow: (change) => {
      const values = change as Record<string, unknown>;
      return Object.fromEntries(written.filter((e) => e.spec.patch && values[e.key] !== undefined).map((e) => [e.name, stored(e, values[e.key])]));
    },
    auditView: (v) =>
      pick(
        entries.filter((e) => e.spec.audit),
        v as Record<string, unknown>,
        'key',
        'name',
      ),
  };
}
