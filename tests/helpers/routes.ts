/**
 * The app's routes as the route tree defines them (`src/routes`), for tests that must cover every
 * route: pages (`+page.svelte` / `+page.server.ts`), their form actions (keys of `actions`), and
 * the methods `+server.ts` files export. A route added later shows up here by itself.
 */
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
export const ROUTES_DIR = path.join(ROOT, 'src/routes');

export type Method = 'GET' | 'HEAD' | 'POST' | 'PUT' | 'PATCH' | 'DELETE' | 'OPTIONS';
export const WRITE_METHODS: Method[] = ['POST', 'PUT', 'PATCH', 'DELETE'];

export interface DiscoveredRoute {
	/** SvelteKit's route id, e.g. `/columns/[id]/edit` */
	route: string;
	kind: 'page' | 'action' | 'endpoint';
	method: Method | 'fallback';
	/** form action name (`default` for the default action) */
	action?: string;
	/** the file that defines it, relative to the project */
	file: string;
	/** `GET /columns/[id]/edit`, `POST /team?/invite`, `POST /columns/new` (default action) */
	key: string;
}

/**
 * Action factories spread into an `actions` object, and the actions each one adds. A new factory
 * must be named here (the scan fails on an unknown spread rather than miss its actions).
 */
const SPREAD_FACTORIES: Record<string, string[]> = {
	verdictActions: ['signOff', 'comment']
};

function walk(dir: string): string[] {
	const out: string[] = [];
	for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
		const full = path.join(dir, entry.name);
		if (entry.isDirectory()) out.push(...walk(full));
		else out.push(full);
	}
	return out;
}

function routeIdOf(dir: string): string {
	const rel = path.relative(ROUTES_DIR, dir).split(path.sep).filter(Boolean);
	return '/' + rel.join('/');
}

/** The URL path of a route id: groups `(name)` leave no segment. */
export function routePath(routeId: string): string {
	const segments = routeId.split('/').filter((s) => s && !/^\(.+\)$/.test(s));
	return '/' + segments.join('/');
}

/** Strips comments and the contents of string and template literals (keeps the quotes). */
function stripCode(src: string): string {
	let out = '';
	let i = 0;
	while (i < src.length) {
		const c = src[i];
		const next = src[i + 1];
		if (c === '/' && next === '/') {
			while (i < src.length && src[i] !== '\n') i++;
		} else if (c === '/' && next === '*') {
			i = src.indexOf('*/', i + 2);
			i = i < 0 ? src.length : i + 2;
		} else if (c === "'" || c === '"' || c === '`') {
			out += c;
			i++;
			while (i < src.length && src[i] !== c) {
				if (src[i] === '\\') i++;
				i++;
			}
			out += c;
			i++;
		} else {
			out += c;
			i++;
		}
	}
	return out;
}

/** Names of the form actions a `+page.server.ts` defines (empty when it has none). */
export function actionNames(file: string): string[] {
	const src = stripCode(fs.readFileSync(file, 'utf8'));
	const m = /export\s+const\s+actions\b[^=]*=\s*\{/.exec(src);
	if (!m) {
		if (/export\s+(const|let|function)\s+actions\b|export\s*\{[^}]*\bactions\b/.test(src)) {
			throw new Error(`${file}: actions are exported in a form this scan does not read; write them as \`export const actions = { … }\``);
		}
		return [];
	}
	const names: string[] = [];
	let depth = 1;
	let i = m.index + m[0].length;
	let atKey = true;
	while (i < src.length && depth > 0) {
		const c = src[i];
		if (c === '{' || c === '(' || c === '[') depth++;
		else if (c === '}' || c === ')' || c === ']') depth--;
		else if (depth === 1 && c === ',') atKey = true;
		else if (depth === 1 && atKey && /\S/.test(c)) {
			const rest = src.slice(i);
			const spread = /^\.\.\.\s*([A-Za-z_$][\w$]*)/.exec(rest);
			const key = /^(?:async\s+)?([A-Za-z_$][\w$]*)\s*(?=[:(,}])/.exec(rest);
			if (spread) {
				const added = SPREAD_FACTORIES[spread[1]];
				if (!added) throw new Error(`${file}: actions spread from ${spread[1]}(…), which tests/helpers/routes.ts does not know`);
				names.push(...added);
			} else if (key) {
				names.push(key[1]);
			} else {
				throw new Error(`${file}: cannot read the actions object near "${rest.slice(0, 40)}"`);
			}
			atKey = false;
			continue;
		}
		i++;
	}
	return names;
}

/** Methods a `+server.ts` exports (`fallback` as is). */
export function endpointMethods(file: string): (Method | 'fallback')[] {
	const src = stripCode(fs.readFileSync(file, 'utf8'));
	const found = new Set<Method | 'fallback'>();
	const re = /export\s+(?:const|let|async\s+function|function)\s+(GET|HEAD|POST|PUT|PATCH|DELETE|OPTIONS|fallback)\b/g;
	for (const m of src.matchAll(re)) found.add(m[1] as Method | 'fallback');
	for (const m of src.matchAll(/export\s*\{([^}]*)\}/g)) {
		for (const part of m[1].split(',')) {
			const name = part.trim().split(/\s+as\s+/).pop()?.trim();
			if (name && /^(GET|HEAD|POST|PUT|PATCH|DELETE|OPTIONS|fallback)$/.test(name)) found.add(name as Method | 'fallback');
		}
	}
	return [...found];
}

export function actionKey(route: string, action: string): string {
	const p = routePath(route);
	return action === 'default' ? `POST ${p}` : `POST ${p}?/${action}`;
}

/** Every page, form action and endpoint method of the route tree, sorted by key. */
export function discoverRoutes(): DiscoveredRoute[] {
	const files = walk(ROUTES_DIR);
	const out: DiscoveredRoute[] = [];
	const dirs = new Set(files.map((f) => path.dirname(f)));
	for (const dir of dirs) {
		const route = routeIdOf(dir);
		const rel = (name: string) => path.relative(ROOT, path.join(dir, name));
		const has = (name: string) => fs.existsSync(path.join(dir, name));
		const p = routePath(route);
		if (has('+page.svelte') || has('+page.server.ts') || has('+page.ts')) {
			out.push({ route, kind: 'page', method: 'GET', file: rel(has('+page.server.ts') ? '+page.server.ts' : '+page.svelte'), key: `GET ${p}` });
		}
		if (has('+page.server.ts')) {
			for (const action of actionNames(path.join(dir, '+page.server.ts'))) {
				out.push({ route, kind: 'action', method: 'POST', action, file: rel('+page.server.ts'), key: actionKey(route, action) });
			}
		}
		if (has('+server.ts')) {
			for (const method of endpointMethods(path.join(dir, '+server.ts'))) {
				out.push({ route, kind: 'endpoint', method, file: rel('+server.ts'), key: `${method} ${p}` });
			}
		}
	}
	return out.sort((a, b) => a.key.localeCompare(b.key));
}
