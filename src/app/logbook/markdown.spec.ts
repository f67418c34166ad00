import { describe, expect, it } from 'vitest';
import { renderMarkdown } from './markdown';

describe('renderMarkdown', () => {
  it('renders the usual formatting', () => {
    const html = renderMarkdown('Coil **x** *warm*\n\n- flow `2.9 L/min`\n- [notes](https://lab.example/notes)');
    expect(html).toContain('<strong>x</strong>');
    expect(html).toContain('<em>warm</em>');
    expect(html).toContain('<li>flow <code>2.9 L/min</code></li>');
    expect(html).toContain('<a target="_blank" rel="noopener noreferrer" href="https://lab.example/notes">notes</a>');
  });

  it('shows raw HTML as text and never produces scripts, handlers, images or script links', () => {
    const html = renderMarkdown('<script>alert(1)</script> <img src=x onerror=alert(1)> [x](javascript:alert(1)) ![p](https://elsewhere.example/p.png)');
    const box = document.createElement('div');
    box.innerHTML = html;
    expect(box.querySelectorAll('script, img, iframe, [onerror]').length).toBe(0);
    expect(box.textContent).toContain('<script>alert(1)</script>');
    expect(box.querySelector('a')?.getAttribute('href') ?? null).toBeNull();
  });
});
