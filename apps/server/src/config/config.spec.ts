import { mkdtempSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from './config.js';

const tempDir = () => mkdtempSync(path.join(tmpdir(), 'steadyhand-config-'));

describe('loadConfig', () => {
  it('stops with a message naming each bad variable', () => {
    expect(() => loadConfig({ DATA_DIR: tempDir(), PORT: 'eighty', LOG_LEVEL: 'chatty' })).toThrow(ConfigError);
    try {
      loadConfig({ DATA_DIR: tempDir(), PORT: 'eighty', LOG_LEVEL: 'chatty' });
    } catch (err) {
      expect((err as Error).message).toMatch(/PORT/);
      expect((err as Error).message).toMatch(/LOG_LEVEL/);
    }
  });

  it('makes a session secret in the data folder on first start, readable only by the owner, and keeps it', () => {
    const dataDir = tempDir();
    const first = loadConfig({ DATA_DIR: dataDir });
    const second = loadConfig({ DATA_DIR: dataDir });
    expect(first.sessionSecret.length).toBeGreaterThanOrEqual(48);
    expect(second.sessionSecret).toBe(first.sessionSecret);
    const file = path.join(dataDir, 'keys', 'session-secret');
    expect(readFileSync(file, 'utf8').trim()).toBe(first.sessionSecret);
    expect(statSync(file).mode & 0o777).toBe(0o600);
    expect(loadConfig({ DATA_DIR: tempDir() }).sessionSecret).not.toBe(first.sessionSecret);
  });

  it('turns on secure cookies only for an https public origin, and allows that origin', () => {
    const plain = loadConfig({ DATA_DIR: tempDir(), PORT: '3100' });
    expect(plain.secureCookies).toBe(false);
    expect(plain.allowedOrigins).toContain('http://localhost:3100');
    const secure = loadConfig({ DATA_DIR: tempDir(), PUBLIC_ORIGIN: 'https://code.harbourview.example/' });
    expect(secure.secureCookies).toBe(true);
    expect(secure.allowedOrigins).toContain('https://code.harbourview.example');
  });
});
