// Imported first by the API tests, before anything reads the environment: session cookies need a
// signing secret. `npm test` may set its own; this test-only value is used when it does not.
process.env.NEXTAUTH_SECRET ??= "integration-tests-only-secret-0123456789abcdef";
export {};
