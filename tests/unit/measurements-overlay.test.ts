import { describe, expect, it } from 'vitest';
import { displayUnit, overlayPoints } from '../../src/lib/measurements/overlay.js';

describe('measurement overlays', () => {
	const items = [
		{ measurement: { id: 'a', kind: 'holdup-radial' as const, name: 'radial', data: { x: [0.5], y: [0.1] } } },
		{ measurement: { id: 'b', kind: 'pressure-height' as const, name: 'taps', data: { x: [0.5, 1], y: [110000, 105000] } } }
	];

	it('picks the measurement that goes with the charted field and scales it', () => {
		expect(overlayPoints({ items, caseKind: 'height-profile', field: 'pressure', scale: 1e-3 })).toEqual({ label: 'taps', x: [0.5, 1], y: [110, 105] });
		expect(overlayPoints({ items, caseKind: 'cross-section', field: 'holdup', xScale: 0.1 })).toEqual({ label: 'radial', x: [0.05], y: [0.1] });
		expect(overlayPoints({ items, caseKind: 'height-profile', field: 'holdup' })).toBeNull();
	});

	it('shows pressures in kPa and dimensionless values with a dash', () => {
		expect(displayUnit('pressure-height')).toEqual({ unit: 'kPa', scale: 1e-3 });
		expect(displayUnit('holdup-height')).toEqual({ unit: '–', scale: 1 });
		expect(displayUnit('liquid-velocity-radial')).toEqual({ unit: 'm/s', scale: 1 });
	});
});
