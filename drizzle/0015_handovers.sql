CREATE TABLE "handover_items" (
	"id" serial PRIMARY KEY NOT NULL,
	"text" text NOT NULL,
	"handover_id" integer NOT NULL,
	"opened_by" text NOT NULL,
	"opened_at" timestamp with time zone DEFAULT now() NOT NULL,
	"closed_by" text,
	"closed_at" timestamp with time zone,
	"close_note" text
);
--> statement-breakpoint
CREATE TABLE "handovers" (
	"id" serial PRIMARY KEY NOT NULL,
	"status" text NOT NULL,
	"author" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"period_from" timestamp with time zone NOT NULL,
	"period_to" timestamp with time zone NOT NULL,
	"record" jsonb NOT NULL,
	"summary" text DEFAULT '' NOT NULL,
	"notes" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"new_items" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"carried_item_ids" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"submitted_by" text,
	"submitted_at" timestamp with time zone,
	"accepted_by" text,
	"accepted_at" timestamp with time zone,
	"accept_comment" text,
	"items_at_acceptance" jsonb
);
--> statement-breakpoint
ALTER TABLE "handover_items" ADD CONSTRAINT "handover_items_handover_id_handovers_id_fk" FOREIGN KEY ("handover_id") REFERENCES "public"."handovers"("id") ON DELETE no action ON UPDATE no action;