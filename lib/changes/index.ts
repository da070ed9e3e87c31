// The change-request workflow: pure rules, no React, Next or database.
export * from "./roles";
export * from "./errors";
export * from "./rules";
export * from "./schema";
export * from "./validate";
export * from "./conflicts";
export * from "./auditChain";
export * from "./workOrder";
