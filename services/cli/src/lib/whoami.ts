import { Profile } from '@localis/shared';
import { ApiClient } from './api-client';
import { CliError, EXIT, isCliError } from './cli-error';
import { DEFAULT_PROFILE } from './credentials';
import { resolveConnection, type Connection } from './connection';
import { maskToken } from './mask-token';
import { terminalOutput, type Output } from './output';

export interface WhoamiOptions {
  profile: string;
  json: boolean;
}

export async function whoami(opts: WhoamiOptions, io: Output = terminalOutput, env: NodeJS.ProcessEnv = process.env): Promise<void> {
  const connection = resolveConnection({ profile: opts.profile }, env);
  const client = new ApiClient(connection);
  try {
    if (opts.json) {
      // The portal's own answer, untouched, for scripts and jq.
      io.out(JSON.stringify(await client.get('/me'), null, 2));
      return;
    }
    io.out(formatProfile(await client.get('/me', Profile), connection));
  } catch (e) {
    if (isCliError(e) && e.exitCode === EXIT.notSignedIn) {
      const hint =
        connection.tokenFrom === 'LOCALIS_TOKEN'
          ? 'The token comes from LOCALIS_TOKEN; set a valid one, or unset it to use the stored profile.'
          : `Run \`localis login${connection.profile === DEFAULT_PROFILE ? '' : ` --profile ${connection.profile}`}\` with a new token.`;
      throw new CliError(e.message, { exitCode: e.exitCode, details: e.details, hint, cause: e });
    }
    throw e;
  }
}

/** Aligned label/value lines: readable at a glance, and still greppable (`localis whoami | grep roles`). */
export function formatProfile(me: Profile, connection: Connection): string {
  const { person, groups } = me;
  const groupLines = groups.length ? groups.map((g) => (g.isPi ? `${g.name} (PI)` : g.name)) : ['none'];
  const rows: [string, string][] = [
    ['institution', person.institutionName ?? 'none'],
    ['roles', person.roles.join(', ') || 'none'],
    ...groupLines.map((line, i): [string, string] => [i === 0 ? 'groups' : '', line]),
    ['portal', `${connection.url}${connection.urlFrom === 'LOCALIS_URL' ? ' (from LOCALIS_URL)' : ''}`],
    [
      'token',
      `${maskToken(connection.token)} ${connection.tokenFrom === 'LOCALIS_TOKEN' ? '(from LOCALIS_TOKEN)' : `(profile "${connection.profile}")`}`,
    ],
  ];
  const width = Math.max(...rows.map(([label]) => label.length)) + 2;
  return [`${person.name} <${person.email}>`, ...rows.map(([label, value]) => `  ${label.padEnd(width)}${value}`)].join('\n');
}
