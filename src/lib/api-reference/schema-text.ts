/**
 * Plain-text summaries of JSON Schema pieces of the OpenAPI document, for the reference page
 * (`/team/api`): a type label, the constraints, and the properties of an object to list.
 */
export type Schema = Record<string, unknown>;

const asSchema = (v: unknown): Schema | null => (v && typeof v === 'object' && !Array.isArray(v) ? (v as Schema) : null);

export function refName(s: Schema): string | null {
	return typeof s.$ref === 'string' ? s.$ref.replace('#/components/schemas/', '') : null;
}

/** `anyOf: [X, null]` and `type: [T, 'null']` as X plus nullable. */
export function unwrapNullable(s: Schema): { schema: Schema; nullable: boolean } {
	const anyOf = Array.isArray(s.anyOf) ? (s.anyOf as Schema[]) : null;
	if (anyOf && anyOf.length === 2 && anyOf.some((x) => x.type === 'null')) {
		const inner = anyOf.find((x) => x.type !== 'null') as Schema;
		const { anyOf: _a, ...rest } = s;
		return { schema: { ...rest, ...inner }, nullable: true };
	}
	if (Array.isArray(s.type) && s.type.includes('null') && s.type.length === 2) {
		return { schema: { ...s, type: s.type.find((t) => t !== 'null') }, nullable: true };
	}
	return { schema: s, nullable: false };
}

/** An object alternative told apart by a constant `kind`: `object (kind "sweep")`. */
function variantName(s: Schema): string | null {
	const kind = asSchema(asSchema(s.properties)?.kind);
	return kind && kind.const !== undefined ? `object (kind ${JSON.stringify(kind.const)})` : null;
}

/** A short type label: `string (uuid)`, `integer`, `array of Run`, `one of: a, b`, `Run | null`. */
export function typeLabel(input: Schema): string {
	const { schema: s, nullable } = unwrapNullable(input);
	const label = baseLabel(s);
	return nullable ? `${label} | null` : label;
}

function baseLabel(s: Schema): string {
	const ref = refName(s);
	if (ref) return ref;
	if (s.const !== undefined) return JSON.stringify(s.const);
	if (Array.isArray(s.enum)) return `one of: ${(s.enum as unknown[]).map((v) => JSON.stringify(v)).join(', ')}`;
	for (const key of ['anyOf', 'oneOf'] as const) {
		if (Array.isArray(s[key])) return (s[key] as Schema[]).map((x) => variantName(x) ?? typeLabel(x)).join(' | ');
	}
	if (s.type === 'array') {
		if (Array.isArray(s.prefixItems)) return `[${(s.prefixItems as Schema[]).map((x) => typeLabel(x)).join(', ')}]`;
		const items = asSchema(s.items);
		return items ? `array of ${typeLabel(items)}` : 'array';
	}
	if (s.type === 'object') {
		const values = asSchema(s.additionalProperties);
		if (!s.properties && values) return `map of ${typeLabel(values)}`;
		return 'object';
	}
	if (typeof s.type === 'string') return typeof s.format === 'string' ? `${s.type} (${s.format})` : s.type;
	if (Array.isArray(s.type)) return s.type.join(' | ');
	return 'any';
}

/** Ranges, lengths, unit and default, e.g. `0.1 – 50 m · default 2`. */
export function constraints(input: Schema): string {
	const { schema: s } = unwrapNullable(input);
	const parts: string[] = [];
	const unit = typeof s['x-unit'] === 'string' && s['x-unit'] !== '1' ? ` ${s['x-unit']}` : '';
	const min = typeof s.minimum === 'number' ? s.minimum : typeof s.exclusiveMinimum === 'number' ? s.exclusiveMinimum : undefined;
	const max = typeof s.maximum === 'number' ? s.maximum : undefined;
	const big = (n: number) => Math.abs(n) >= Number.MAX_SAFE_INTEGER;
	if (min !== undefined && max !== undefined && !big(min) && !big(max)) parts.push(`${typeof s.exclusiveMinimum === 'number' ? '> ' : ''}${min} – ${max}${unit}`);
	else if (min !== undefined && !big(min)) parts.push(`${typeof s.exclusiveMinimum === 'number' ? '>' : '≥'} ${min}${unit}`);
	else if (max !== undefined && !big(max)) parts.push(`≤ ${max}${unit}`);
	else if (unit) parts.push(unit.trim());
	if (typeof s.minLength === 'number' || typeof s.maxLength === 'number') parts.push(`${s.minLength ?? 0}–${s.maxLength ?? '∞'} characters`);
	if (typeof s.minItems === 'number' || typeof s.maxItems === 'number') {
		if (!Array.isArray(s.prefixItems)) parts.push(`${s.minItems ?? 0}–${s.maxItems ?? '∞'} items`);
	}
	if (typeof s.pattern === 'string') parts.push(`pattern ${s.pattern}`);
	if (s.default !== undefined && !(typeof s.default === 'object' && s.default && Object.keys(s.default).length === 0)) parts.push(`default ${JSON.stringify(s.default)}`);
	return parts.join(' · ');
}

export interface PropertyRow {
	name: string;
	required: boolean;
	schema: Schema;
	/** a nested object (or array of objects, or union of objects) whose fields to list below */
	nested: Schema | null;
	/** a union of objects (one table each) */
	variants: Schema[];
	description: string;
}

/** The object schema whose fields can be listed (an object, the items of an array, a nullable object). */
export function listable(input: Schema): Schema | null {
	const { schema: s } = unwrapNullable(input);
	if (refName(s)) return null;
	if (s.type === 'object' && asSchema(s.properties)) return s;
	if (s.type === 'array') {
		const items = asSchema(s.items);
		return items ? listable(items) : null;
	}
	return null;
}

/** The alternatives of a union of objects (e.g. the study kinds), each listable. */
export function alternatives(input: Schema): Schema[] {
	const { schema: s } = unwrapNullable(input);
	const list = (Array.isArray(s.oneOf) ? s.oneOf : Array.isArray(s.anyOf) ? s.anyOf : []) as Schema[];
	return list.filter((x) => listable(x) !== null);
}

export function propertyRows(s: Schema): PropertyRow[] {
	const props = asSchema(s.properties) ?? {};
	const required = new Set(Array.isArray(s.required) ? (s.required as string[]) : []);
	return Object.entries(props).map(([name, value]) => {
		const schema = value as Schema;
		const inner = unwrapNullable(schema).schema;
		const description = [inner.title, inner.description, schema.description].filter((x): x is string => typeof x === 'string' && x !== '');
		return {
			name,
			required: required.has(name),
			schema,
			nested: listable(schema),
			variants: alternatives(schema),
			description: [...new Set(description)].join(' — ')
		};
	});
}

/** Escaped text with `code` and **bold** made into HTML (the document's descriptions use just those). */
export function inlineMarkup(text: string): string {
	const escaped = text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
	return escaped.replace(/`([^`]+)`/g, '<code class="font-mono text-[0.85em] bg-structure-100 rounded px-1">$1</code>').replace(/\*\*([^*]+)\*\*/g, '<strong>$1</strong>');
}
