/**
 * What a server component can hand to a client component: React serialises props, and Portolan sends
 * dates as ISO strings (as the API does). `Serialised<T>` is T with every Date turned into a string,
 * at any depth; `serialiseDates` makes a value of that type.
 */
export type Serialised<T> = T extends Date
  ? string
  : T extends readonly unknown[]
    ? { [K in keyof T]: Serialised<T[K]> }
    : T extends object
      ? { [K in keyof T]: Serialised<T[K]> }
      : T;

/** Date → ISO string, recursively for plain objects and arrays (see Serialised). */
export function serialiseDates<T>(value: T): Serialised<T> {
  return convert(value) as Serialised<T>; // the recursion below builds exactly the mapped type
}

function convert(value: unknown): unknown {
  if (value instanceof Date) return value.toISOString();
  if (Array.isArray(value)) return value.map(convert);
  if (value && typeof value === "object") return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, convert(v)]));
  return value;
}
