import { describe, expect, it } from 'vitest';
import { lineKindForEquipment } from './price-book-kinds';

describe('lineKindForEquipment', () => {
	it.each([
		['side-door', 'setup'],
		['wide-door', 'setup'],
		['roller-bed', 'setup'],
		['latch-trolley', 'setup'],
		['latch-adapter', 'setup'],
		['exchange-stand', 'setup'],
		['pallet-truck', 'setup'],
		['lifting-beam', 'setup'],
		['charger', 'charger'],
		['battery', 'battery'],
		['watering-kit', 'accessory'],
		['something-new', 'accessory']
	])('%s → %s', (kind, lineKind) => expect(lineKindForEquipment(kind)).toBe(lineKind));
});
