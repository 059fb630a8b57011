/** The CLI process's environment (see childEnv.js). */
export function childEnv(env?: NodeJS.ProcessEnv): NodeJS.ProcessEnv;
