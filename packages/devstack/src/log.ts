// The runner's output helpers live in ../tools.mjs (plain JavaScript, shared with bootstrap.mjs).
export { say, warn, StackError, ToolFailure, Interrupted } from "../tools.mjs";
