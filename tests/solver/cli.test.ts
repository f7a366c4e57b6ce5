import { describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

const tsx = resolve('node_modules/.bin/tsx');

describe('the solver command line', () => {
	it('runs a case file, prints the design numbers and writes the profiles as CSV', () => {
		const dir = mkdtempSync(join(tmpdir(), 'twofold-cli-'));
		const casePath = join(dir, 'case.json');
		writeFileSync(casePath, JSON.stringify({ schemaVersion: 1, name: 'Small column', geometry: { heightM: 1, diameterM: 0.2, clearLiquidLevelM: 0.7 }, numerics: { cells: 40 } }));
		const csvPath = join(dir, 'profiles.csv');
		const out = execFileSync(tsx, ['solver/cli.ts', casePath, '--csv', csvPath, '--quiet'], { encoding: 'utf8' });
		expect(out).toMatch(/status: converged/);
		expect(out).toMatch(/Overall gas holdup of the aerated region\s+0\.1\d+/);
		const lines = readFileSync(csvPath, 'utf8').trim().split('\n');
		expect(lines[0]).toBe('z_m,holdup_1,gasVelocity_m_per_s,liquidVelocity_m_per_s,pressure_Pa,gasDensity_kg_per_m3,slip_m_per_s,sauterDiameter_m');
		expect(lines.length).toBe(41);
		// first cell centre at Δz/2 = 0.0125 m
		expect(Number(lines[1].split(',')[0])).toBeCloseTo(0.0125, 12);
	});

	it('refuses an invalid case with the field and the limit, and a non-zero exit code', () => {
		const dir = mkdtempSync(join(tmpdir(), 'twofold-cli-'));
		const casePath = join(dir, 'bad.json');
		writeFileSync(casePath, JSON.stringify({ schemaVersion: 1, numerics: { cflNumber: 3 } }));
		const r = spawnSync(tsx, ['solver/cli.ts', casePath], { encoding: 'utf8' });
		expect(r.status).toBe(1);
		expect(r.stderr).toMatch(/numerics\.cflNumber: CFL number must be at most 1/);
	});
});
