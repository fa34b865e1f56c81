// Runs before the app's modules (a deferred script placed ahead of them in index.html). The contracts'
// schemas then check the API's answers without compiling code: zod otherwise probes `new Function` as
// each schema is made, which the Content-Security-Policy (script-src 'self') refuses and reports.
globalThis.__zod_globalConfig = Object.assign(globalThis.__zod_globalConfig || {}, { jitless: true });
