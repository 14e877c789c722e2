ALTER TABLE "attachments" ADD COLUMN "subject" text;--> statement-breakpoint
ALTER TABLE "attachments" ADD COLUMN "thumbnail_key" text;--> statement-breakpoint
CREATE INDEX "attachments_visit_idx" ON "attachments" USING btree ("visit_id");--> statement-breakpoint
CREATE INDEX "attachments_radon_test_idx" ON "attachments" USING btree ("radon_test_id");--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_subject" CHECK (subject is null or (kind = 'photo' and subject in ('manometer', 'fan', 'suction_point', 'other')));