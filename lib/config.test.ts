import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ConfigError, cachedReader, configSchema, parseConfig } from './config';
import { jobsConfig } from './jobs/config';

const root = path.resolve(__dirname, '..');
const minimal = {
  DATABASE_URL: 'postgres://unitwise:pw@127.0.0.1:5432/unitwise',
  AUTH_SECRET: 'a-secret-of-at-least-thirty-two-characters',
};

function problems(source: Record<string, string | undefined>, role: 'web' | 'worker' = 'web'): string[] {
  try {
    parseConfig(source, role as 'web');
  } catch (err) {
    expect(err).toBeInstanceOf(ConfigError);
    return (err as ConfigError).problems.map((p) => `${p.variable}: ${p.message}`);
  }
  return [];
}

describe('the configuration schema', () => {
  it('fills every default for a minimal web deployment', () => {
    const c = parseConfig(minimal, 'web');
    expect(c).toMatchObject({
      LISTEN_HOST: '127.0.0.1',
      PORT: 3000,
      APP_URL: 'http://localhost:3000',
      TRUST_PROXY: 'false',
      RATE_LIMIT_SCALE: 1,
      LOG_LEVEL: 'info',
      SMTP_SECURE: false,
      DEV_OUTBOX: false,
      SIM_CHUNK_EXPIRE_SECONDS: 20,
      SIM_MAX_REPLICATES: 200_000,
    });
  });

  it('needs the signing secret on the web server but not in a worker', () => {
    expect(problems({ DATABASE_URL: minimal.DATABASE_URL }, 'web')).toEqual(['AUTH_SECRET: must be set']);
    expect(problems({ DATABASE_URL: minimal.DATABASE_URL }, 'worker')).toEqual([]);
  });

  it('names every bad variable with what it must be and the value it got', () => {
    const found = problems({
      ...minimal,
      PORT: '99999',
      SIM_CHUNK_EXPIRE_SECONDS: '2.5',
      SIM_POLL_SECONDS: 'soon',
      RATE_LIMIT_SCALE: '0',
      LOG_LEVEL: 'loud',
      TRUST_PROXY: 'yes',
      LISTEN_HOST: 'not a host!',
      APP_URL: 'ftp://files.example.org',
    });
    expect(found).toEqual(
      expect.arrayContaining([
        'PORT: must be a whole number of at least 1 and at most 65535 (got "99999")',
        'SIM_CHUNK_EXPIRE_SECONDS: must be a whole number of at least 1 (got "2.5")',
        'SIM_POLL_SECONDS: must be a number of at least 0.5 (got "soon")',
        'RATE_LIMIT_SCALE: must be a number above 0 (got "0")',
        'LOG_LEVEL: must be one of debug, info, warn, error (got "loud")',
        'TRUST_PROXY: must be true or false (got "yes")',
        expect.stringMatching(/^LISTEN_HOST: must be an address .* \(got "not a host!"\)$/),
        'APP_URL: must be a URL such as https://unitwise.example.org (got "ftp://files.example.org")',
      ]),
    );
    expect(found).toHaveLength(8);
  });

  it('never repeats a secret in its message', () => {
    const found = problems({ DATABASE_URL: 'mysql://root:hunter2@db/x', AUTH_SECRET: 'short-secret' });
    expect(found.join('\n')).not.toMatch(/hunter2|short-secret/);
    expect(found).toHaveLength(2);
  });

  it('treats an empty value as unset, as .env.example leaves optional ones', () => {
    const c = parseConfig({ ...minimal, SMTP_USER: '', OUTBOX_DIR: '', SIM_WORKER_THREADS: '', PORT: '' }, 'web');
    expect(c.SMTP_USER).toBeUndefined();
    expect(c.OUTBOX_DIR).toBeUndefined();
    expect(c.SIM_WORKER_THREADS).toBeUndefined();
    expect(c.PORT).toBe(3000);
  });

  it('re-reads a variable that changed since the last call', () => {
    const source: Record<string, string> = { SIM_MAX_ACTIVE_RUNS: '2' };
    const read = cachedReader(configSchema.pick({ SIM_MAX_ACTIVE_RUNS: true }), () => source);
    const first = read();
    expect(read()).toBe(first);
    source.SIM_MAX_ACTIVE_RUNS = '5';
    expect(read().SIM_MAX_ACTIVE_RUNS).toBe(5);
  });

  it('gives the queue its settings through jobsConfig()', () => {
    process.env.SIM_CHUNK_EXPIRE_SECONDS = '7';
    try {
      expect(jobsConfig().expireSeconds).toBe(7);
      process.env.SIM_CHUNK_EXPIRE_SECONDS = 'never';
      expect(() => jobsConfig()).toThrow(/SIM_CHUNK_EXPIRE_SECONDS: must be a whole number of at least 1 \(got "never"\)/);
    } finally {
      delete process.env.SIM_CHUNK_EXPIRE_SECONDS;
    }
    expect(jobsConfig().expireSeconds).toBe(20);
  });

  describe.each(['.env.example', 'README.md'])('%s', (file) => {
    const text = fs.readFileSync(path.join(root, file), 'utf8');
    it.each(Object.keys(configSchema.shape).filter((k) => k !== 'NODE_ENV'))('lists %s', (name) => {
      expect(text).toMatch(new RegExp(file === 'README.md' ? `\`${name}\`` : `^#? ?${name}=`, 'm'));
    });
  });
});
