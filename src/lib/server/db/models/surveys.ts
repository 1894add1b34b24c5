import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from 'sequelize';
import { sequelize } from '../index';

export class Survey extends Model<InferAttributes<Survey>, InferCreationAttributes<Survey>> {
	declare id: CreationOptional<string>;
	declare customerId: string;
	declare siteId: string | null;
	declare ownerId: string;
	declare teamId: string | null;
	declare status: CreationOptional<'draft' | 'complete'>;
	declare currentStep: CreationOptional<string>;
	declare data: CreationOptional<Record<string, unknown>>;
	declare version: CreationOptional<number>;
	declare chosenSetup: CreationOptional<string | null>;
	declare result: CreationOptional<Record<string, unknown> | null>;
	declare evaluatedInput: CreationOptional<Record<string, unknown> | null>;
	declare chosenAt: CreationOptional<Date | null>;
	declare chosenBy: CreationOptional<string | null>;
	declare clientToken: CreationOptional<string | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;
}

Survey.init(
	{
		id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
		customerId: { type: DataTypes.UUID, allowNull: false },
		siteId: { type: DataTypes.UUID, allowNull: true },
		ownerId: { type: DataTypes.UUID, allowNull: false },
		teamId: { type: DataTypes.UUID, allowNull: true },
		status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'draft' },
		currentStep: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'site' },
		data: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
		version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
		chosenSetup: { type: DataTypes.TEXT, allowNull: true },
		result: { type: DataTypes.JSONB, allowNull: true },
		evaluatedInput: { type: DataTypes.JSONB, allowNull: true },
		chosenAt: { type: DataTypes.DATE, allowNull: true },
		chosenBy: { type: DataTypes.UUID, allowNull: true },
		clientToken: { type: DataTypes.TEXT, allowNull: true },
		createdAt: DataTypes.DATE,
		updatedAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'surveys' }
);
