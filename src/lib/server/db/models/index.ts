import {
	DataTypes,
	Model,
	type CreationOptional,
	type ForeignKey,
	type InferAttributes,
	type InferCreationAttributes
} from 'sequelize';
import { sequelize } from '../index';

export type Role = 'rep' | 'manager' | 'admin';
export type UnitSystem = 'metric' | 'imperial';

const uuidPk = { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 };
// bigint columns come back from pg as strings; money stays integer cents in JS numbers
// (safe up to 2^53 cents, far beyond any quote).
const cents = (field: string) => ({
	type: DataTypes.BIGINT,
	allowNull: false,
	defaultValue: 0,
	get(this: Model) {
		return Number(this.getDataValue(field as never));
	}
});

export class Team extends Model<InferAttributes<Team>, InferCreationAttributes<Team>> {
	declare id: CreationOptional<string>;
	declare name: string;
}
Team.init({ id: uuidPk, name: { type: DataTypes.TEXT, allowNull: false } }, { sequelize, tableName: 'teams' });

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
	declare id: CreationOptional<string>;
	declare email: string;
	declare name: string;
	declare role: Role;
	declare teamId: ForeignKey<Team['id']> | null;
	declare passwordHash: string;
	declare active: CreationOptional<boolean>;
	declare unitSystem: CreationOptional<UnitSystem>;
	declare createdAt: CreationOptional<Date>;
}
User.init(
	{
		id: uuidPk,
		email: { type: DataTypes.TEXT, allowNull: false },
		name: { type: DataTypes.TEXT, allowNull: false },
		role: { type: DataTypes.TEXT, allowNull: false },
		teamId: { type: DataTypes.UUID, allowNull: true },
		passwordHash: { type: DataTypes.TEXT, allowNull: false },
		active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
		unitSystem: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'metric' },
		createdAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'users' }
);

export class Session extends Model<InferAttributes<Session>, InferCreationAttributes<Session>> {
	declare id: string;
	declare userId: string;
	declare expiresAt: Date;
}
Session.init(
	{
		id: { type: DataTypes.TEXT, primaryKey: true },
		userId: { type: DataTypes.UUID, allowNull: false },
		expiresAt: { type: DataTypes.DATE, allowNull: false }
	},
	{ sequelize, tableName: 'sessions', updatedAt: false }
);

export class TruckModel extends Model<InferAttributes<TruckModel>, InferCreationAttributes<TruckModel>> {
	declare id: CreationOptional<string>;
	declare code: string;
	declare name: string;
	declare family: string;
	declare capacityKg: number;
	declare spec: Record<string, unknown>;
	declare priceCents: CreationOptional<number>;
	declare costCents: CreationOptional<number>;
	declare retired: CreationOptional<boolean>;
}
TruckModel.init(
	{
		id: uuidPk,
		code: { type: DataTypes.TEXT, allowNull: false },
		name: { type: DataTypes.TEXT, allowNull: false },
		family: { type: DataTypes.TEXT, allowNull: false },
		capacityKg: { type: DataTypes.INTEGER, allowNull: false },
		spec: { type: DataTypes.JSONB, allowNull: false },
		priceCents: cents('priceCents'),
		costCents: cents('costCents'),
		retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false }
	},
	{ sequelize, tableName: 'truck_models' }
);

export class Battery extends Model<InferAttributes<Battery>, InferCreationAttributes<Battery>> {
	declare id: CreationOptional<string>;
	declare code: string;
	declare name: string;
	declare spec: Record<string, unknown>;
	declare priceCents: CreationOptional<number>;
	declare costCents: CreationOptional<number>;
	declare retired: CreationOptional<boolean>;
}
Battery.init(
	{
		id: uuidPk,
		code: { type: DataTypes.TEXT, allowNull: false },
		name: { type: DataTypes.TEXT, allowNull: false },
		spec: { type: DataTypes.JSONB, allowNull: false },
		priceCents: cents('priceCents'),
		costCents: cents('costCents'),
		retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false }
	},
	{ sequelize, tableName: 'batteries' }
);

export class TruckModelBattery extends Model<
	InferAttributes<TruckModelBattery>,
	InferCreationAttributes<TruckModelBattery>
> {
	declare truckModelId: string;
	declare batteryId: string;
}
TruckModelBattery.init(
	{
		truckModelId: { type: DataTypes.UUID, primaryKey: true },
		batteryId: { type: DataTypes.UUID, primaryKey: true }
	},
	{ sequelize, tableName: 'truck_model_batteries', timestamps: false }
);

export class Equipment extends Model<InferAttributes<Equipment>, InferCreationAttributes<Equipment>> {
	declare id: CreationOptional<string>;
	declare sku: string;
	declare kind: string;
	declare name: string;
	declare spec: CreationOptional<Record<string, unknown>>;
	declare priceCents: CreationOptional<number>;
	declare costCents: CreationOptional<number>;
	declare retired: CreationOptional<boolean>;
}
Equipment.init(
	{
		id: uuidPk,
		sku: { type: DataTypes.TEXT, allowNull: false },
		kind: { type: DataTypes.TEXT, allowNull: false },
		name: { type: DataTypes.TEXT, allowNull: false },
		spec: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
		priceCents: cents('priceCents'),
		costCents: cents('costCents'),
		retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false }
	},
	{ sequelize, tableName: 'equipment' }
);

TruckModel.belongsToMany(Battery, { through: TruckModelBattery, foreignKey: 'truckModelId', otherKey: 'batteryId', as: 'batteries' });
Battery.belongsToMany(TruckModel, { through: TruckModelBattery, foreignKey: 'batteryId', otherKey: 'truckModelId', as: 'trucks' });
User.belongsTo(Team, { foreignKey: 'teamId', as: 'team' });
