import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes
} from 'sequelize';
import { sequelize } from '../index';

/** Mail kinds the app sends; stored as text so new kinds need no migration. */
export type MailKind =
	| 'quote-to-customer'
	| 'approval-request'
	| 'approval-decision'
	| 'acceptance-receipt'
	| 'deposit-receipt'
	| 'password-reset'
	| 'fresh-link'
	| 'test';
export type OutboxStatus = 'queued' | 'sending' | 'sent' | 'failed';
export type PaymentStatus = 'open' | 'pending' | 'paid' | 'expired';

const uuidPk = { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 };

export class MailOutbox extends Model<InferAttributes<MailOutbox>, InferCreationAttributes<MailOutbox>> {
	declare id: CreationOptional<string>;
	declare kind: MailKind;
	declare toAddress: string;
	declare replyTo: string | null;
	declare subject: string;
	declare text: string;
	declare html: string | null;
	declare status: CreationOptional<OutboxStatus>;
	declare attempts: CreationOptional<number>;
	declare nextAttemptAt: CreationOptional<Date>;
	declare lockedUntil: CreationOptional<Date | null>;
	declare claimId: CreationOptional<string | null>;
	declare lastError: CreationOptional<string | null>;
	declare sentAt: CreationOptional<Date | null>;
	declare messageId: string;
	declare dedupeKey: string;
	declare relatedType: string | null;
	declare relatedId: string | null;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;
}
MailOutbox.init(
	{
		id: uuidPk,
		kind: { type: DataTypes.TEXT, allowNull: false },
		toAddress: { type: DataTypes.TEXT, allowNull: false },
		replyTo: { type: DataTypes.TEXT, allowNull: true },
		subject: { type: DataTypes.TEXT, allowNull: false },
		text: { type: DataTypes.TEXT, allowNull: false },
		html: { type: DataTypes.TEXT, allowNull: true },
		status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'queued' },
		attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
		nextAttemptAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
		lockedUntil: { type: DataTypes.DATE, allowNull: true },
		claimId: { type: DataTypes.UUID, allowNull: true },
		lastError: { type: DataTypes.TEXT, allowNull: true },
		sentAt: { type: DataTypes.DATE, allowNull: true },
		messageId: { type: DataTypes.TEXT, allowNull: false },
		dedupeKey: { type: DataTypes.TEXT, allowNull: false },
		relatedType: { type: DataTypes.TEXT, allowNull: true },
		relatedId: { type: DataTypes.UUID, allowNull: true },
		createdAt: DataTypes.DATE,
		updatedAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'mail_outbox' }
);

export class MailOutboxAttachment extends Model<
	InferAttributes<MailOutboxAttachment>,
	InferCreationAttributes<MailOutboxAttachment>
> {
	declare id: CreationOptional<string>;
	declare outboxId: string;
	declare position: number;
	declare filename: string;
	declare contentType: string;
	declare sizeBytes: number;
	declare content: Buffer;
}
MailOutboxAttachment.init(
	{
		id: uuidPk,
		outboxId: { type: DataTypes.UUID, allowNull: false },
		position: { type: DataTypes.INTEGER, allowNull: false },
		filename: { type: DataTypes.TEXT, allowNull: false },
		contentType: { type: DataTypes.TEXT, allowNull: false },
		sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
		content: { type: DataTypes.BLOB, allowNull: false }
	},
	{ sequelize, tableName: 'mail_outbox_attachments', timestamps: false }
);

export interface CaughtHeader {
	key: string;
	value: string;
}

export class CaughtMail extends Model<InferAttributes<CaughtMail>, InferCreationAttributes<CaughtMail>> {
	declare id: CreationOptional<string>;
	declare receivedAt: CreationOptional<Date>;
	declare envelopeFrom: string | null;
	declare envelopeTo: string[];
	declare fromAddress: string | null;
	declare toAddress: string | null;
	declare cc: string | null;
	declare replyTo: string | null;
	declare subject: string | null;
	declare messageId: string | null;
	declare sentAt: Date | null;
	declare headers: CaughtHeader[];
	declare text: string | null;
	declare html: string | null;
	declare sizeBytes: number;
	declare raw: Buffer;
}
CaughtMail.init(
	{
		id: uuidPk,
		receivedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
		envelopeFrom: { type: DataTypes.TEXT, allowNull: true },
		envelopeTo: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
		fromAddress: { type: DataTypes.TEXT, allowNull: true },
		toAddress: { type: DataTypes.TEXT, allowNull: true },
		cc: { type: DataTypes.TEXT, allowNull: true },
		replyTo: { type: DataTypes.TEXT, allowNull: true },
		subject: { type: DataTypes.TEXT, allowNull: true },
		messageId: { type: DataTypes.TEXT, allowNull: true },
		sentAt: { type: DataTypes.DATE, allowNull: true },
		headers: { type: DataTypes.JSONB, allowNull: false },
		text: { type: DataTypes.TEXT, allowNull: true },
		html: { type: DataTypes.TEXT, allowNull: true },
		sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
		raw: { type: DataTypes.BLOB, allowNull: false }
	},
	{ sequelize, tableName: 'caught_mail', timestamps: false }
);

export class CaughtMailAttachment extends Model<
	InferAttributes<CaughtMailAttachment>,
	InferCreationAttributes<CaughtMailAttachment>
> {
	declare id: CreationOptional<string>;
	declare caughtMailId: string;
	declare position: number;
	declare filename: string | null;
	declare contentType: string;
	declare sizeBytes: number;
	declare checksumSha256: string;
	declare contentId: string | null;
	declare content: Buffer;
}
CaughtMailAttachment.init(
	{
		id: uuidPk,
		caughtMailId: { type: DataTypes.UUID, allowNull: false },
		position: { type: DataTypes.INTEGER, allowNull: false },
		filename: { type: DataTypes.TEXT, allowNull: true },
		contentType: { type: DataTypes.TEXT, allowNull: false },
		sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
		checksumSha256: { type: DataTypes.TEXT, allowNull: false },
		contentId: { type: DataTypes.TEXT, allowNull: true },
		content: { type: DataTypes.BLOB, allowNull: false }
	},
	{ sequelize, tableName: 'caught_mail_attachments', timestamps: false }
);

// bigint columns come back from pg as strings; cents stay JS numbers (safe far beyond any deposit)
export class Payment extends Model<InferAttributes<Payment>, InferCreationAttributes<Payment>> {
	declare id: CreationOptional<string>;
	declare checkoutSessionId: string;
	declare quoteId: string | null;
	declare revisionId: string | null;
	declare purpose: CreationOptional<string>;
	declare amountCents: number;
	declare currency: string;
	declare status: PaymentStatus;
	declare checkoutUrl: string | null;
	declare expiresAt: Date | null;
	declare idempotencyKey: string | null;
	declare paymentIntentId: CreationOptional<string | null>;
	declare customerEmail: string | null;
	declare paidAt: CreationOptional<Date | null>;
	declare rawEvent: CreationOptional<Record<string, unknown> | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;
}
Payment.init(
	{
		id: uuidPk,
		checkoutSessionId: { type: DataTypes.TEXT, allowNull: false },
		quoteId: { type: DataTypes.UUID, allowNull: true },
		revisionId: { type: DataTypes.UUID, allowNull: true },
		purpose: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'deposit' },
		amountCents: {
			type: DataTypes.BIGINT,
			allowNull: false,
			get(this: Payment) {
				return Number(this.getDataValue('amountCents'));
			}
		},
		currency: { type: DataTypes.TEXT, allowNull: false },
		status: { type: DataTypes.TEXT, allowNull: false },
		checkoutUrl: { type: DataTypes.TEXT, allowNull: true },
		expiresAt: { type: DataTypes.DATE, allowNull: true },
		idempotencyKey: { type: DataTypes.TEXT, allowNull: true },
		paymentIntentId: { type: DataTypes.TEXT, allowNull: true },
		customerEmail: { type: DataTypes.TEXT, allowNull: true },
		paidAt: { type: DataTypes.DATE, allowNull: true },
		rawEvent: { type: DataTypes.JSONB, allowNull: true },
		createdAt: DataTypes.DATE,
		updatedAt: DataTypes.DATE
	},
	{ sequelize, tableName: 'payments' }
);

export class PaymentEvent extends Model<InferAttributes<PaymentEvent>, InferCreationAttributes<PaymentEvent>> {
	declare eventId: string;
	declare type: string;
	declare objectId: string | null;
	declare receivedAt: CreationOptional<Date>;
	declare payload: Record<string, unknown>;
}
PaymentEvent.init(
	{
		eventId: { type: DataTypes.TEXT, primaryKey: true },
		type: { type: DataTypes.TEXT, allowNull: false },
		objectId: { type: DataTypes.TEXT, allowNull: true },
		receivedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
		payload: { type: DataTypes.JSONB, allowNull: false }
	},
	{ sequelize, tableName: 'payment_events', timestamps: false }
);

MailOutbox.hasMany(MailOutboxAttachment, { foreignKey: 'outboxId', as: 'attachments' });
CaughtMail.hasMany(CaughtMailAttachment, { foreignKey: 'caughtMailId', as: 'attachments' });
