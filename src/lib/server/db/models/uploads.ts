import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes
} from 'sequelize';
import { sequelize } from '../index';
import type { OwnerType, UploadKind } from '../../../uploads';

/** One stored file. `storedName` and `thumbName` are server-made names under UPLOAD_DIR. */
export class Upload extends Model<InferAttributes<Upload>, InferCreationAttributes<Upload>> {
	declare id: CreationOptional<string>;
	declare ownerType: OwnerType;
	declare ownerId: string;
	declare kind: UploadKind;
	/** sanitised, for display and download names only — never part of a path */
	declare originalName: string;
	declare storedName: string;
	declare thumbName: string | null;
	/** from the file's bytes, not from what the browser claimed */
	declare mime: string;
	declare sizeBytes: number;
	declare sha256: string;
	declare width: number | null;
	declare height: number | null;
	declare createdBy: string | null;
	declare createdAt: CreationOptional<Date>;
}
Upload.init(
	{
		id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
		ownerType: { type: DataTypes.TEXT, allowNull: false },
		ownerId: { type: DataTypes.UUID, allowNull: false },
		kind: { type: DataTypes.TEXT, allowNull: false },
		originalName: { type: DataTypes.TEXT, allowNull: false },
		storedName: { type: DataTypes.TEXT, allowNull: false },
		thumbName: { type: DataTypes.TEXT, allowNull: true },
		mime: { type: DataTypes.TEXT, allowNull: false },
		sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
		sha256: { type: DataTypes.TEXT, allowNull: false },
		width: { type: DataTypes.INTEGER, allowNull: true },
		height: { type: DataTypes.INTEGER, allowNull: true },
		createdBy: { type: DataTypes.UUID, allowNull: true },
		createdAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'uploads', updatedAt: false }
);
