/** The engine named in every record; bump with package.json. */
export const ENGINE_NAME = "trialwright";
export const ENGINE_VERSION = "0.1.0";
export const ENGINE = `${ENGINE_NAME} ${ENGINE_VERSION}`;
