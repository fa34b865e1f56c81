import pino from "pino";

/** Structured JSON logs. Secrets, cookies and passwords are never written. */
export function createLogger(level: string, destination?: pino.DestinationStream) {
  return pino(
    {
      level,
      base: { service: "grainyard-api" },
      redact: {
        paths: [
          "req.headers.cookie",
          "req.headers.authorization",
          'req.headers["x-csrf-token"]',
          'res.headers["set-cookie"]',
          "*.password",
          "*.passwordHash",
          "*.token",
          "password",
          "token",
        ],
        censor: "[hidden]",
      },
    },
    destination as pino.DestinationStream,
  );
}
export type Logger = ReturnType<typeof createLogger>;
