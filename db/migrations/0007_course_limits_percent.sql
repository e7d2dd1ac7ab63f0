-- Course and assignment limits say percentages, as the screens do: velocityScale 0.7 becomes
-- speedPercent 70 and accelerationScale 0.5 becomes accelPercent 50 (lib/shared/schemas/courses.ts).
UPDATE "courses" SET "limits" = ("limits" - 'velocityScale' - 'accelerationScale')
  || CASE WHEN "limits" ? 'velocityScale' THEN jsonb_build_object('speedPercent', ("limits"->>'velocityScale')::numeric * 100) ELSE '{}'::jsonb END
  || CASE WHEN "limits" ? 'accelerationScale' THEN jsonb_build_object('accelPercent', ("limits"->>'accelerationScale')::numeric * 100) ELSE '{}'::jsonb END
WHERE "limits" ?| array['velocityScale', 'accelerationScale'];
--> statement-breakpoint
UPDATE "assignments" SET "limits" = ("limits" - 'velocityScale' - 'accelerationScale')
  || CASE WHEN "limits" ? 'velocityScale' THEN jsonb_build_object('speedPercent', ("limits"->>'velocityScale')::numeric * 100) ELSE '{}'::jsonb END
  || CASE WHEN "limits" ? 'accelerationScale' THEN jsonb_build_object('accelPercent', ("limits"->>'accelerationScale')::numeric * 100) ELSE '{}'::jsonb END
WHERE "limits" ?| array['velocityScale', 'accelerationScale'];
