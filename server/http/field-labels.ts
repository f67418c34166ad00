/**
 * Field labels for the 400 messages: every write route's schema carries, on each field, the
 * label the screen that sends it shows (zod metadata `title`), so a refusal names the field as
 * the form labels it (`Reason for the reset: must not be empty`), never by its key in the JSON.
 * `parseInput` and the generic edge check both read the labels through `fieldLabel`.
 */
import { z } from 'zod';

/** Labels of the inputs inside a field that the route checks with its own code (a sample profile, a level set), by path below that field. */
export type InnerLabels = (path: readonly PropertyKey[]) => string | null;

const innerLabels = new WeakMap<z.ZodType, InnerLabels>();

/** `schema` with the form's label for the field, e.g. `labelled(reasonText(), 'Reason for the reset')`. */
export function labelled<T extends z.ZodType>(schema: T, label: string): T {
  return schema.meta({ title: label }) as T;
}

/** A field labelled `label` and checked by the route's own code (`z.unknown()`), whose inputs `labels` names. */
export function labelledInside<T extends z.ZodType>(schema: T, label: string, labels: InnerLabels): T {
  const field = labelled(schema, label);
  innerLabels.set(field, labels);
  return field;
}

type Def = {
  type: string;
  innerType?: z.ZodType;
  in?: z.ZodType;
  shape?: Record<string, z.ZodType>;
  element?: z.ZodType;
  items?: z.ZodType[];
  valueType?: z.ZodType;
};

const WRAPPERS = new Set(['optional', 'nullable', 'default', 'prefault', 'readonly', 'catch', 'nonoptional']);

/** The schema under optional/default/pipe wrappers, with the first label met on the way. */
function unwrap(schema: z.ZodType): { node: z.ZodType; title: string | null; inner: InnerLabels | null } {
  let node = schema;
  let title: string | null = null;
  let inner: InnerLabels | null = null;
  for (;;) {
    title ??= (z.globalRegistry.get(node)?.title as string | undefined) ?? null;
    inner ??= innerLabels.get(node) ?? null;
    const def = node.def as unknown as Def;
    if (WRAPPERS.has(def.type) && def.innerType) node = def.innerType;
    else if (def.type === 'pipe' && def.in) node = def.in;
    else return { node, title, inner };
  }
}

function child(node: z.ZodType, key: PropertyKey): z.ZodType | null {
  const def = node.def as unknown as Def;
  if (def.type === 'object') return def.shape?.[String(key)] ?? null;
  if (def.type === 'array') return def.element ?? null;
  if (def.type === 'tuple') return def.items?.[Number(key)] ?? null;
  if (def.type === 'record') return def.valueType ?? null;
  return null;
}

/**
 * The label of the field at `path` in a request checked by `schema`, as the form shows it; a
 * list item is counted from 1 after the list's label ("Open item 2"). Null when the field has
 * no label (not a field of the form).
 */
export function fieldLabel(schema: z.ZodType, path: readonly PropertyKey[]): string | null {
  const rows: string[] = [];
  let listTitle: string | null = null;
  let { node, title, inner } = unwrap(schema);
  for (let i = 0; i < path.length; i++) {
    if (inner) return inner(path.slice(i)) ?? title;
    const next = child(node, path[i]);
    if (!next) return null;
    const type = (node.def as unknown as Def).type;
    if ((type === 'array' || type === 'tuple') && title) {
      rows.push(`${title} ${Number(path[i]) + 1}`);
      listTitle = title;
    }
    ({ node, title, inner } = unwrap(next));
  }
  if (title === null) return rows.length > 0 ? rows.join(', ') : null;
  // An item whose only input carries the list's own label: "Open item 2", not "Open item 2, Open item".
  return title === listTitle ? rows.join(', ') : [...rows, title].join(', ');
}

/** "Label: message" for a field, or the message alone for the request as a whole. */
export function labelledMessage(label: string | null, path: readonly PropertyKey[], message: string): string {
  if (path.length === 0) return message;
  const name = label ?? path.join('.');
  // Messages of the route's own checks may name the field already ("|B| must be at most 200 G").
  return message.startsWith(name) ? message : `${name}: ${message}`;
}
