-- A sign-in try is recorded as a failure when it is admitted and marked a success only after
-- bcrypt agrees (lib/data/sign-in.ts), so tries in flight count against the pace.
GRANT UPDATE (succeeded) ON sign_in_attempts TO rhizo_app;
