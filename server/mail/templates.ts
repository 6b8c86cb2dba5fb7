import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Handlebars from 'handlebars';

export type TemplateName = 'invite' | 'password-reset' | 'review-requested' | 'review-decided';

const TEMPLATE_DIR = join(import.meta.dirname, '..', '..', 'templates');
const cache = new Map<string, HandlebarsTemplateDelegate>();

function compiled(file: string): HandlebarsTemplateDelegate {
  let template = cache.get(file);
  if (!template) {
    // Only the HTML part needs HTML escaping; escaping the plain-text part would mangle links.
    const noEscape = !file.endsWith('.html.hbs');
    template = Handlebars.compile(readFileSync(join(TEMPLATE_DIR, file), 'utf8'), { strict: true, noEscape });
    cache.set(file, template);
  }
  return template;
}

interface RenderedMail {
  subject: string;
  text: string;
  html: string;
}

/** Renders `templates/<name>.subject.hbs`, `.txt.hbs` and `.html.hbs` with the same data. */
export function renderMail(name: TemplateName, data: Record<string, unknown>): RenderedMail {
  return {
    subject: compiled(`${name}.subject.hbs`)(data).trim(),
    text: compiled(`${name}.txt.hbs`)(data),
    html: compiled(`${name}.html.hbs`)(data),
  };
}
