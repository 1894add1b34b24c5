/**
 * The Traywise rules engine: pure TypeScript, no framework, database or SDK imports.
 * Entry: `evaluate(input, catalogue, params?)`.
 */

export * from './types';
export { evaluate } from './evaluate';
export { DEFAULT_PARAMS, resolveParams, type RuleParams } from './params';
export {
	buildEngineCatalogue,
	fromCatalogueFile,
	type CatalogueFile,
	prepareCatalogue,
	EQUIPMENT_KINDS,
	KIND_LABELS,
	type BatteryRow,
	type EquipmentRow,
	type PreparedCatalogue
} from './catalogue';
export {
	batteryEnergyKwh,
	equivalentBatteryUsage,
	exchangePoints,
	planDuty,
	rotation,
	usableOf,
	type DutyPlan,
	type Rotation
} from './fleet';
export {
	batteryGas,
	cellsOf,
	gasCurrentA,
	naturalOpeningCm2,
	nfpaFloorM3h,
	stationaryAirFlowM3h,
	tractionAirFlowM3h
} from './ventilation';
export { GOVERNING_NOTE } from './cautions';
export {
	resolveInput,
	isModelRef,
	type ModelLookup,
	type ModelRef,
	type ResolveResult,
	type UnresolvedInput
} from './resolve';
export { DESIGN_EXAMPLE_REQUEST, designExample } from './fixtures';
