import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes
} from 'sequelize';
import { sequelize } from '../index';
import type { LineKind } from '../../quotes/pricing';

export type PriceBookStatus = 'draft' | 'active' | 'archived';

// bigint columns come back from pg as strings; cents stay JS integers (safe far beyond any price)
const cents = (field: string) => ({
	type: DataTypes.BIGINT,
	allowNull: false,
	get(this: Model) {
		return Number(this.getDataValue(field as never));
	}
});

/** One version of the price book; items are written while it is a draft, then frozen. */
export class PriceBookVersion extends Model<
	InferAttributes<PriceBookVersion>,
	InferCreationAttributes<PriceBookVersion>
> {
	declare id: CreationOptional<string>;
	declare label: string;
	/** 'YYYY-MM-DD' */
	declare effectiveDate: string;
	declare status: CreationOptional<PriceBookStatus>;
	declare createdBy: string | null;
	declare publishedAt: CreationOptional<Date | null>;
	declare publishedBy: CreationOptional<string | null>;
	declare createdAt: CreationOptional<Date>;
}
PriceBookVersion.init(
	{
		id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
		label: { type: DataTypes.TEXT, allowNull: false },
		effectiveDate: { type: DataTypes.DATEONLY, allowNull: false },
		status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'draft' },
		createdBy: { type: DataTypes.UUID, allowNull: true },
		publishedAt: { type: DataTypes.DATE, allowNull: true },
		publishedBy: { type: DataTypes.UUID, allowNull: true },
		createdAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'price_book_versions' }
);

/** A priced item of one version: list price and dealer's cost of one unit, in cents. */
export class PriceBookItem extends Model<
	InferAttributes<PriceBookItem>,
	InferCreationAttributes<PriceBookItem>
> {
	declare id: CreationOptional<number>;
	declare versionId: string;
	declare sku: string;
	declare description: string;
	declare kind: LineKind;
	declare listCents: number;
	declare costCents: number;
}
PriceBookItem.init(
	{
		id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
		versionId: { type: DataTypes.UUID, allowNull: false },
		sku: { type: DataTypes.TEXT, allowNull: false },
		description: { type: DataTypes.TEXT, allowNull: false },
		kind: { type: DataTypes.TEXT, allowNull: false },
		listCents: cents('listCents'),
		costCents: cents('costCents')
	},
	{ sequelize, tableName: 'price_book_items', timestamps: false }
);

/** The dealer's settings: one row, id 1. Rates are basis points (1 % = 100 bp). */
export class CompanySettings extends Model<
	InferAttributes<CompanySettings>,
	InferCreationAttributes<CompanySettings>
> {
	declare id: CreationOptional<number>;
	declare dealerName: string;
	declare address: string;
	declare phone: string;
	declare email: string;
	declare logoPath: string | null;
	declare repDiscountAuthorityBp: number;
	declare marginFloorBp: number;
	declare depositShareBp: number;
	declare quoteValidityDays: number;
	declare termsText: string;
	declare currency: string;
	declare timeZone: string;
	declare updatedBy: string | null;
	declare updatedAt: CreationOptional<Date>;
}
CompanySettings.init(
	{
		id: { type: DataTypes.SMALLINT, primaryKey: true, defaultValue: 1 },
		dealerName: { type: DataTypes.TEXT, allowNull: false },
		address: { type: DataTypes.TEXT, allowNull: false },
		phone: { type: DataTypes.TEXT, allowNull: false },
		email: { type: DataTypes.TEXT, allowNull: false },
		logoPath: { type: DataTypes.TEXT, allowNull: true },
		repDiscountAuthorityBp: { type: DataTypes.INTEGER, allowNull: false },
		marginFloorBp: { type: DataTypes.INTEGER, allowNull: false },
		depositShareBp: { type: DataTypes.INTEGER, allowNull: false },
		quoteValidityDays: { type: DataTypes.INTEGER, allowNull: false },
		termsText: { type: DataTypes.TEXT, allowNull: false },
		currency: { type: DataTypes.TEXT, allowNull: false },
		timeZone: { type: DataTypes.TEXT, allowNull: false },
		updatedBy: { type: DataTypes.UUID, allowNull: true },
		updatedAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'company_settings' }
);

/** Sales tax of one region, basis points (7.25 % = 725 bp). */
export class TaxRate extends Model<InferAttributes<TaxRate>, InferCreationAttributes<TaxRate>> {
	declare id: CreationOptional<string>;
	declare regionCode: string;
	declare label: string;
	declare rateBp: number;
}
TaxRate.init(
	{
		id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
		regionCode: { type: DataTypes.TEXT, allowNull: false },
		label: { type: DataTypes.TEXT, allowNull: false },
		rateBp: { type: DataTypes.INTEGER, allowNull: false }
	},
	{ sequelize, tableName: 'tax_rates' }
);
