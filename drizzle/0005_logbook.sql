CREATE TABLE "logbook_attachments" (
	"id" serial PRIMARY KEY NOT NULL,
	"entry_id" integer NOT NULL,
	"file_name" text NOT NULL,
	"content_type" text NOT NULL,
	"size_bytes" integer NOT NULL,
	"data" "bytea" NOT NULL
);
--> statement-breakpoint
CREATE TABLE "logbook_entries" (
	"id" serial PRIMARY KEY NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"at" timestamp with time zone NOT NULL,
	"author" text NOT NULL,
	"text" text NOT NULL,
	"tags" text[] DEFAULT '{}'::text[] NOT NULL,
	"link_kind" text,
	"link_ref" text,
	"amends" integer,
	"search" "tsvector" GENERATED ALWAYS AS (to_tsvector('english'::regconfig, "logbook_entries"."text")) STORED NOT NULL
);
--> statement-breakpoint
ALTER TABLE "logbook_attachments" ADD CONSTRAINT "logbook_attachments_entry_id_logbook_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."logbook_entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "logbook_entries" ADD CONSTRAINT "logbook_entries_amends_logbook_entries_id_fk" FOREIGN KEY ("amends") REFERENCES "public"."logbook_entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "logbook_attachments_entry" ON "logbook_attachments" USING btree ("entry_id");--> statement-breakpoint
CREATE INDEX "logbook_entries_at" ON "logbook_entries" USING btree ("at");--> statement-breakpoint
CREATE INDEX "logbook_entries_search" ON "logbook_entries" USING gin ("search");--> statement-breakpoint
CREATE INDEX "logbook_entries_tags" ON "logbook_entries" USING gin ("tags");--> statement-breakpoint
CREATE INDEX "logbook_entries_amends" ON "logbook_entries" USING btree ("amends");