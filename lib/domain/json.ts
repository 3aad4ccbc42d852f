/** The shape a value has after JSON.stringify and JSON.parse: dates become ISO strings. */
export type Jsonified<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Jsonified<U>[]
    : T extends object
      ? { [K in keyof T]: Jsonified<T[K]> }
      : T;

/**
 * Gives a server-rendered page the same shape its route handler answers with, so a client component can
 * take it as initial data and later replace it with fetched JSON without a type or format change.
 */
export const asJson = <T,>(value: T): Jsonified<T> => JSON.parse(JSON.stringify(value)) as Jsonified<T>;
