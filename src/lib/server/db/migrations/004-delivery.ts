import type { Migration } from '../migrate';

/**
 * Delivery infrastructure: the mail outbox the worker drains, the local catcher's store of received
 * mail, and the payment provider's checkout sessions, payments and webhook events.
 * Quote tables do not exist yet, so `related_id` / `quote_id` are plain uuids without a foreign key.
 */
export const up: Migration = async ({ context }) => {
	await context.sequelize.query(`
		CREATE TABLE mail_outbox (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			kind text NOT NULL,
			to_address text NOT NULL,
			reply_to text,
			subject text NOT NULL,
			text text NOT NULL,
			html text,
			status text NOT NULL DEFAULT 'queued' CHECK (status IN ('queued', 'sending', 'sent', 'failed')),
			attempts integer NOT NULL DEFAULT 0,
			next_attempt_at timestamptz NOT NULL DEFAULT now(),
			-- a worker that claims a row holds it until locked_until; a crashed worker's claim lapses
			locked_until timestamptz,
			claim_id uuid,
			last_error text,
			sent_at timestamptz,
			message_id text NOT NULL,
			dedupe_key text NOT NULL UNIQUE,
			related_type text,
			related_id uuid,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX mail_outbox_due ON mail_outbox (next_attempt_at) WHERE status = 'queued';
		CREATE INDEX mail_outbox_claimed ON mail_outbox (locked_until) WHERE status = 'sending';
		CREATE INDEX mail_outbox_related ON mail_outbox (related_type, related_id);
		CREATE INDEX mail_outbox_created ON mail_outbox (created_at DESC);

		-- attachment bytes live beside the row so listings never load them
		CREATE TABLE mail_outbox_attachments (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			outbox_id uuid NOT NULL REFERENCES mail_outbox(id) ON DELETE CASCADE,
			position integer NOT NULL,
			filename text NOT NULL,
			content_type text NOT NULL,
			size_bytes integer NOT NULL,
			content bytea NOT NULL,
			UNIQUE (outbox_id, position)
		);

		CREATE TABLE caught_mail (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			received_at timestamptz NOT NULL DEFAULT now(),
			envelope_from text,
			envelope_to text[] NOT NULL DEFAULT '{}',
			from_address text,
			to_address text,
			cc text,
			reply_to text,
			subject text,
			message_id text,
			sent_at timestamptz,
			headers jsonb NOT NULL DEFAULT '[]'::jsonb,
			text text,
			html text,
			size_bytes integer NOT NULL,
			raw bytea NOT NULL
		);
		CREATE INDEX caught_mail_received ON caught_mail (received_at DESC);
		CREATE INDEX caught_mail_message_id ON caught_mail (message_id);

		CREATE TABLE caught_mail_attachments (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			caught_mail_id uuid NOT NULL REFERENCES caught_mail(id) ON DELETE CASCADE,
			position integer NOT NULL,
			filename text,
			content_type text NOT NULL,
			size_bytes integer NOT NULL,
			checksum_sha256 text NOT NULL,
			content_id text,
			content bytea NOT NULL,
			UNIQUE (caught_mail_id, position)
		);

		-- one row per checkout session the app created (status open) or learnt of from a webhook
		CREATE TABLE payments (
			id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
			checkout_session_id text NOT NULL UNIQUE,
			quote_id uuid,
			revision_id uuid,
			purpose text NOT NULL DEFAULT 'deposit',
			amount_cents bigint NOT NULL CHECK (amount_cents >= 0),
			currency text NOT NULL,
			status text NOT NULL CHECK (status IN ('open', 'pending', 'paid', 'expired')),
			checkout_url text,
			expires_at timestamptz,
			idempotency_key text,
			payment_intent_id text,
			customer_email text,
			paid_at timestamptz,
			raw_event jsonb,
			created_at timestamptz NOT NULL DEFAULT now(),
			updated_at timestamptz NOT NULL DEFAULT now()
		);
		CREATE INDEX payments_quote ON payments (quote_id);
		CREATE INDEX payments_revision ON payments (revision_id);

		-- every webhook event handled, by the provider's event id: a redelivery finds its row and stops
		CREATE TABLE payment_events (
			event_id text PRIMARY KEY,
			type text NOT NULL,
			object_id text,
			received_at timestamptz NOT NULL DEFAULT now(),
			payload jsonb NOT NULL
		);
		CREATE INDEX payment_events_object ON payment_events (object_id);
	`);
};

export const down: Migration = async ({ context }) => {
	await context.sequelize.query(`
		DROP TABLE IF EXISTS payment_events, payments, caught_mail_attachments, caught_mail,
			mail_outbox_attachments, mail_outbox CASCADE;
	`);
};
