import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';

describe('configuration', () => {
  it('when production lacks real mail and signing settings, then the server refuses to start and names them', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(
      /SMTP_URL, SIGNING_P12_PATH, SIGNING_P12_PASSWORD, TSA_URL \(or TSA_URL=none to sign without trusted time\), VOLTFALL_PUBLIC_URL/,
    );
  });

  it('when production names no time-stamping authority, then it refuses to start unless TSA_URL=none says so explicitly', () => {
    const base = {
      NODE_ENV: 'production',
      SMTP_URL: 'smtp://relay.example.test:25',
      SIGNING_P12_PATH: '/srv/voltfall/org.p12',
      SIGNING_P12_PASSWORD: 'secret',
      VOLTFALL_PUBLIC_URL: 'https://voltfall.example.test',
    };
    expect(() => loadConfig(base)).toThrow(/TSA_URL/);
    expect(loadConfig({ ...base, TSA_URL: 'none' }).signing.tsaUrl).toBe('none');
    expect(loadConfig({ ...base, TSA_URL: 'https://tsa.example.test/rfc3161' }).signing.tsaUrl).toBe('https://tsa.example.test/rfc3161');
    expect(() => loadConfig({ ...base, TSA_URL: 'not a url' })).toThrow(/TSA_URL/);
  });

  it('when production has them, then there is no demo seed', () => {
    const config = loadConfig({
      NODE_ENV: 'production',
      SMTP_URL: 'smtp://relay.example.test:25',
      SIGNING_P12_PATH: '/srv/voltfall/org.p12',
      SIGNING_P12_PASSWORD: 'secret',
      TSA_URL: 'https://tsa.example.test/rfc3161',
      VOLTFALL_PUBLIC_URL: 'https://voltfall.example.test',
      VOLTFALL_SEED_DEMO: 'true',
    });
    expect(config.production).toBe(true);
    expect(config.seedDemo).toBe(false);
  });

  it('when a setting is malformed, then start-up fails naming it', () => {
    expect(() => loadConfig({ PORT: 'eighty' })).toThrow(/PORT/);
  });

  it('outside production the defaults run the demo on port 8080 with data in ./data', () => {
    const config = loadConfig({});
    expect(config.port).toBe(8080);
    expect(config.seedDemo).toBe(true);
    expect(config.dataDir).toMatch(/\/data$/);
  });
});
