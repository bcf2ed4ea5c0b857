import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { LinkifiedText, splitLinks } from './linkified-text';
import { withTopLevelLinks } from './message-view';

describe('mail text links', () => {
  it('makes web addresses clickable without swallowing the sentence’s punctuation', () => {
    render(
      <p>
        <LinkifiedText text={'Choose a password: http://localhost:3000/reset-password?token=abc123.\nThanks!'} />
      </p>,
    );
    const link = screen.getByRole('link');
    expect(link).toHaveAttribute('href', 'http://localhost:3000/reset-password?token=abc123');
    expect(link).toHaveAttribute('target', '_self');
    expect(link.parentElement).toHaveTextContent('abc123. Thanks!');
  });

  it('links only http and https addresses and never renders text as HTML', () => {
    expect(splitLinks('see javascript:alert(1) or <b>bold</b>')).toEqual([
      { kind: 'text', text: 'see javascript:alert(1) or <b>bold</b>' },
    ]);
    expect(splitLinks('(https://a.example/x) and https://b.example')).toEqual([
      { kind: 'text', text: '(' },
      { kind: 'link', href: 'https://a.example/x' },
      { kind: 'text', text: ') and ' },
      { kind: 'link', href: 'https://b.example' },
    ]);
  });

  it('makes links in the HTML part open in the app, not inside the frame', () => {
    expect(withTopLevelLinks('<html><head><title>x</title></head><body></body></html>')).toBe(
      '<html><head><base target="_top"><title>x</title></head><body></body></html>',
    );
    expect(withTopLevelLinks('<p>Hello</p>')).toBe('<base target="_top"><p>Hello</p>');
  });
});
