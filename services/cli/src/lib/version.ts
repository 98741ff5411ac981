import packageJson from '../../package.json' with { type: 'json' };

/** From package.json, so `--version` and the User-Agent the api logs cannot drift apart. */
export const CLI_VERSION: string = packageJson.version;
