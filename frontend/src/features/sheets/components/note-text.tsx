/** A note's Markdown drawn from the same document model as the signed package, maths by KaTeX. */
import { Box, Typography } from '@mui/material';
import { ScrollBox } from '../../../components/scroll-box';
import { Fragment, useMemo } from 'react';
import { linkText, parseNote, type NoteBlock, type NoteInline } from '@ampwright/common/notes/markdown';
import { monoFont, palette } from '../../../app/theme';
import { Tex } from './tex';

function Inlines({ inlines }: { inlines: NoteInline[] }) {
  return (
    <>
      {inlines.map((r, i) => {
        if (r.kind === 'maths')
          return (
            <Tex key={i} display={r.display}>
              {r.tex}
            </Tex>
          );
        if (r.kind === 'break') return <br key={i} />;
        // A link is shown as its text and address, never followed from a note.
        if (r.kind === 'link')
          return (
            <span key={i} className="aw-note-link">
              {linkText(r)}
            </span>
          );
        const style = { fontWeight: r.strong ? 700 : undefined, fontStyle: r.emphasis ? 'italic' : undefined, fontFamily: r.code ? monoFont : undefined };
        return (
          <span key={i} style={style}>
            {r.text}
          </span>
        );
      })}
    </>
  );
}

function Block({ block }: { block: NoteBlock }) {
  switch (block.kind) {
    case 'heading':
      return (
        <Typography variant={block.level === 1 ? 'h2' : block.level === 2 ? 'h3' : 'h4'} component="p" gutterBottom>
          <Inlines inlines={block.inlines} />
        </Typography>
      );
    case 'paragraph':
      return (
        <Typography sx={{ mb: 1.5, ...(block.quote ? { pl: 1.5, borderLeft: `3px solid ${palette.rule}` } : {}) }}>
          <Inlines inlines={block.inlines} />
        </Typography>
      );
    case 'list': {
      const Tag = block.ordered ? 'ol' : 'ul';
      return (
        <Box component={Tag} start={block.ordered ? block.start : undefined} sx={{ mt: 0, mb: 1.5, pl: 3 }}>
          {block.items.map((item, i) => (
            <Typography component="li" key={i}>
              <Inlines inlines={item} />
            </Typography>
          ))}
        </Box>
      );
    }
    case 'maths':
      return (
        <ScrollBox label="Formula, scrolls sideways" sx={{ mb: 1.5 }}>
          <Tex display>{block.tex}</Tex>
        </ScrollBox>
      );
    case 'code':
      return (
        <ScrollBox component="pre" label="Code, scrolls sideways" sx={{ fontFamily: monoFont, fontSize: 13, bgcolor: palette.paper, p: 1, mt: 0, mb: 1.5 }}>
          {block.text}
        </ScrollBox>
      );
    case 'rule':
      return <Box component="hr" sx={{ border: 0, borderTop: `1px solid ${palette.rule}`, my: 1.5 }} />;
  }
}

export function NoteText({ text }: { text: string }) {
  const blocks = useMemo(() => parseNote(text), [text]);
  return (
    <Box data-testid="note-text">
      {blocks.map((b, i) => (
        <Fragment key={i}>
          <Block block={b} />
        </Fragment>
      ))}
    </Box>
  );
}
