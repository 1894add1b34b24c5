import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes
} from 'sequelize';
import { sequelize } from '../index';
import { User } from './index';

const uuidPk = { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 };

/** A customer of the dealer; every staff member sees every customer. */
export class Customer extends Model<InferAttributes<Customer>, InferCreationAttributes<Customer>> {
	declare id: CreationOptional<string>;
	declare name: string;
	declare accountNumber: string | null;
	declare notes: CreationOptional<string>;
	/** the rep who created it, and that rep's team at the time */
	declare ownerId: string | null;
	declare teamId: string | null;
	/** from the "add a customer" form: a repeat of the same form finds this customer */
	declare clientToken: CreationOptional<string | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;
}
Customer.init(
	{
		id: uuidPk,
		name: { type: DataTypes.TEXT, allowNull: false },
		accountNumber: { type: DataTypes.TEXT, allowNull: true },
		notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
		ownerId: { type: DataTypes.UUID, allowNull: true },
		teamId: { type: DataTypes.UUID, allowNull: true },
		clientToken: { type: DataTypes.TEXT, allowNull: true },
		createdAt: DataTypes.DATE,
		updatedAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'customers' }
);

/** A place where the customer runs trucks: a warehouse, a yard, a cold store. */
export class Site extends Model<InferAttributes<Site>, InferCreationAttributes<Site>> {
	declare id: CreationOptional<string>;
	declare customerId: string;
	declare name: string;
	declare addressLine1: string;
	declare addressLine2: CreationOptional<string>;
	declare city: string;
	declare postalCode: CreationOptional<string>;
	declare country: string;
	/** short tax region code such as `WA` or `EU-DE`, or '' */
	declare regionCode: CreationOptional<string>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;
}
Site.init(
	{
		id: uuidPk,
		customerId: { type: DataTypes.UUID, allowNull: false },
		name: { type: DataTypes.TEXT, allowNull: false },
		addressLine1: { type: DataTypes.TEXT, allowNull: false, field: 'address_line1' },
		addressLine2: { type: DataTypes.TEXT, allowNull: false, defaultValue: '', field: 'address_line2' },
		city: { type: DataTypes.TEXT, allowNull: false },
		postalCode: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
		country: { type: DataTypes.TEXT, allowNull: false },
		regionCode: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
		createdAt: DataTypes.DATE,
		updatedAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'sites' }
);

/** A person at the customer; may belong to one site. */
export class Contact extends Model<InferAttributes<Contact>, InferCreationAttributes<Contact>> {
	declare id: CreationOptional<string>;
	declare customerId: string;
	declare siteId: string | null;
	declare name: string;
	declare roleTitle: CreationOptional<string>;
	declare email: CreationOptional<string>;
	declare phone: CreationOptional<string>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;
}
Contact.init(
	{
		id: uuidPk,
		customerId: { type: DataTypes.UUID, allowNull: false },
		siteId: { type: DataTypes.UUID, allowNull: true },
		name: { type: DataTypes.TEXT, allowNull: false },
		roleTitle: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
		email: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
		phone: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
		createdAt: DataTypes.DATE,
		updatedAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'contacts' }
);

Customer.hasMany(Site, { foreignKey: 'customerId', as: 'sites' });
Site.belongsTo(Customer, { foreignKey: 'customerId', as: 'customer' });
Customer.hasMany(Contact, { foreignKey: 'customerId', as: 'contacts' });
Contact.belongsTo(Site, { foreignKey: 'siteId', as: 'site' });
Customer.belongsTo(User, { foreignKey: 'ownerId', as: 'owner' });
