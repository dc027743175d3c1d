// The HTTP helpers live in test/support/http.ts; this name stays for the tests that still import it.
export * from "../support/http.js";
