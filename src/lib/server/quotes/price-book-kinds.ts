/**
 * Which price-book kind (a quote line kind, pricing.ts) a catalogue equipment item is. Pure.
 *
 * - `setup`: what a handling setup needs around the truck and battery — compartment doors and
 *   covers, roller beds, trolleys and their retrofit kits, stands, the roller stand and battery
 *   changer, the pallet-truck latch adapter, pallet trucks and lifting beams;
 * - `charger`: chargers;
 * - `battery`: batteries;
 * - `accessory`: everything else a rep may add, such as watering kits.
 */
import type { LineKind } from './pricing';

const SETUP_KINDS = new Set([
	'side-door',
	'wide-door',
	'side-cover',
	'service-trolley',
	'latch-trolley',
	'retrofit-kit',
	'roller-bed',
	'exchange-stand',
	'charging-stand',
	'roller-stand',
	'latch-adapter',
	'pallet-truck',
	'lifting-beam'
]);

/** The price-book kind of a catalogue equipment kind (see the module comment). */
export function lineKindForEquipment(equipmentKind: string): LineKind {
	if (equipmentKind === 'charger') return 'charger';
	if (equipmentKind === 'battery') return 'battery';
	return SETUP_KINDS.has(equipmentKind) ? 'setup' : 'accessory';
}
