CREATE TABLE "revoked_sessions" (
	"session_id" uuid PRIMARY KEY NOT NULL,
	"user_id" uuid NOT NULL,
	"revoked_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sign_up_attempts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"ip" text,
	"attempted_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "revoked_sessions" ADD CONSTRAINT "revoked_sessions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "revoked_sessions_expires" ON "revoked_sessions" USING btree ("expires_at");--> statement-breakpoint
CREATE INDEX "sign_up_attempts_email_time" ON "sign_up_attempts" USING btree ("email","attempted_at");--> statement-breakpoint
CREATE INDEX "sign_up_attempts_ip_time" ON "sign_up_attempts" USING btree ("ip","attempted_at");