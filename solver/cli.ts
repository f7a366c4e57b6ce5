/**
 * Command-line runner: `npx tsx solver/cli.ts case.json [--csv profiles.csv] [--quiet]`.
 * Validates the case, runs it to its end (converged, end time or failure), prints the design numbers and
 * optionally writes the final profiles as CSV (one row per cell centre, SI units in the header).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { createSimulation, InvalidCaseError, runToEnd, SOLVER_VERSION } from './index.js';

function usage(): never {
	console.error('usage: npx tsx solver/cli.ts case.json [--csv profiles.csv] [--quiet]');
	process.exit(2);
}

const args = process.argv.slice(2);
const casePath = args.find((a) => !a.startsWith('--'));
if (!casePath) usage();
const csvIndex = args.indexOf('--csv');
const csvPath = csvIndex >= 0 ? args[csvIndex + 1] : undefined;
if (csvIndex >= 0 && !csvPath) usage();
const quiet = args.includes('--quiet');

let doc: unknown;
try {
	doc = JSON.parse(readFileSync(casePath, 'utf8'));
} catch (e) {
	console.error(`Cannot read ${casePath}: ${(e as Error).message}`);
	process.exit(2);
}

let sim;
try {
	sim = createSimulation(doc);
} catch (e) {
	if (e instanceof InvalidCaseError) {
		console.error('The case is invalid:');
		for (const i of e.issues) console.error(`  ${i.path}: ${i.message}`);
		process.exit(1);
	}
	throw e;
}

const t0 = performance.now();
let lastReport = 0;
const results = runToEnd(sim, {
	onProgress: (state, residuals) => {
		if (quiet || state.timeS - lastReport < 5) return;
		lastReport = state.timeS;
		const r = Object.entries(residuals)
			.map(([k, v]) => `${k} ${v.toExponential(2)}`)
			.join(', ');
		console.error(`t = ${state.timeS.toFixed(2)} s, step ${state.step}: ${r}`);
	}
});
const wallS = (performance.now() - t0) / 1000;

console.log(`Twofold solver ${SOLVER_VERSION} — ${results.kind}, "${sim.caseDoc.name}"`);
console.log(`status: ${results.status}${results.message ? ` (${results.message})` : ''}`);
console.log(`steps: ${results.step}, simulated time: ${results.timeS.toFixed(3)} s, wall time: ${wallS.toFixed(3)} s`);
const width = Math.max(...Object.values(results.design).map((d) => d.label.length));
for (const d of Object.values(results.design)) {
	const v = Math.abs(d.value) >= 1e4 || (Math.abs(d.value) < 1e-3 && d.value !== 0) ? d.value.toExponential(4) : d.value.toPrecision(5);
	console.log(`  ${d.label.padEnd(width)}  ${v} ${d.unit === '1' ? '' : d.unit}`.trimEnd());
}

if (csvPath) {
	const p = results.profiles;
	const names = Object.keys(p.fields);
	const units: Record<string, string> = { holdup: '1', gasVelocity: 'm/s', liquidVelocity: 'm/s', pressure: 'Pa', gasDensity: 'kg/m3', slip: 'm/s', sauterDiameter: 'm' };
	// bubble classes: holdupSmall, gasVelocityLarge, ...
	for (const n of names) if (/^holdup[A-Z]/.test(n)) units[n] = '1';
	for (const n of names) if (/^gasVelocity[A-Z]/.test(n)) units[n] = 'm/s';
	// cross-section fields: viscosity and the radial forces on the gas per unit mixture volume
	Object.assign(units, { effectiveViscosity: 'Pa.s', liftForce: 'N/m3', wallLubricationForce: 'N/m3', dispersionForce: 'N/m3', dragForce: 'N/m3' });
	const axis = results.kind === 'cross-section' ? 'r_m' : 'z_m';
	const lines = [[axis, ...names.map((n) => `${n}_${(units[n] ?? '').replace('/', '_per_') || '1'}`)].join(',')];
	for (let i = 0; i < p.x.length; i++) lines.push([p.x[i], ...names.map((n) => p.fields[n][i])].map((v) => String(v)).join(','));
	writeFileSync(csvPath, lines.join('\n') + '\n');
	console.log(`profiles written to ${csvPath} (${p.x.length} rows)`);
}
process.exit(results.status === 'failed' ? 1 : 0);
