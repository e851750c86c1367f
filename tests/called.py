#!/usr/bin/python3
# SPDX-License-Identifier: BSD-3-Clause
# called.py: every doc block with a "Called:" list (ERFA style) in
# include/ and daemon/ matches the body of the function it documents:
# each function the list names is called in the body (names in
# parentheses are called through the one before them, and are not
# checked), and each ERFA function (era*) the body calls is named.  The
# body takes in the file's own static helpers that it calls, directly or
# through one another (ERFA has none; here they are part of the
# function).
# Before checking the tree it is run on planted mismatches and must catch
# them.  Usage: called.py SOURCE_DIR
import os
import re
import sys

IDENT = re.compile(r'\b([A-Za-z_][A-Za-z0-9_]*)\b')
CALL = re.compile(r'\b([A-Za-z_][A-Za-z0-9_]*)\s*\(')
ERA_CALL = re.compile(r'\b(era[A-Z][A-Za-z0-9]*)\s*\(')
KEYWORDS = {'if', 'for', 'while', 'switch', 'return', 'sizeof', 'defined'}


def blocks(text):
    """(list of names, names in parentheses, first line after the block)
    for each comment block holding a Called: section."""
    for m in re.finditer(r'/\*(.*?)\*/', text, re.S):
        body = m.group(1)
        k = body.find('Called:')
        if k < 0:
            continue
        lines = body[k + len('Called:'):].split('\n')
        listed = []
        for ln in lines[1:]:
            s = ln.strip().lstrip('*').strip()
            if s == '' or s.endswith(':'):
                break
            listed.append(s)
        section = ' '.join(listed)
        via = set()
        for p in re.findall(r'\(([^)]*)\)', section):
            via.update(IDENT.findall(p))
        direct = IDENT.findall(re.sub(r'\([^)]*\)', ' ', section))
        yield direct, via, text[m.end():], text[:m.start()].count('\n') + 1


def documented(after):
    """The function a block documents: the first call-like name after it."""
    for m in CALL.finditer(after[:600]):
        if m.group(1) not in KEYWORDS:
            return m.group(1)
    return None


def file_bodies(text):
    """name -> (body, static?) of the functions defined in a C text."""
    out = {}
    for m in re.finditer(r'^((?:static )?[^\n;(){}]*)\n([a-z_][a-z0-9_]*)\('
                         r'[^;{]*?\n\{\n(.*?)\n\}\n', text, re.S | re.M):
        body = re.sub(r'/\*.*?\*/', ' ', m.group(3), flags=re.S)
        out.setdefault(m.group(2), (body, m.group(1).startswith('static')))
    return out


def bodies(src_dir):
    """name -> body of every public function defined in daemon/**/*.c,
    with the bodies of the file's static helpers it calls appended."""
    out = {}
    for root, _, files in os.walk(os.path.join(src_dir, 'daemon')):
        for f in files:
            if not f.endswith('.c'):
                continue
            fb = file_bodies(open(os.path.join(root, f),
                                  encoding='utf-8').read())
            for name, (body, static) in fb.items():
                seen, todo, parts = {name}, [body], []
                while todo:
                    b = todo.pop()
                    parts.append(b)
                    for c in CALL.findall(b):
                        if c in fb and fb[c][1] and c not in seen:
                            seen.add(c)
                            todo.append(fb[c][0])
                out.setdefault(name, '\n'.join(parts))
    return out


def check_text(path, text, defs):
    bad = []
    for direct, via, after, line in blocks(text):
        fn = documented(after)
        if fn is None or fn not in defs:
            bad.append('%s:%d: Called: list of %s, whose body is not found'
                       % (path, line, fn))
            continue
        body = defs[fn]
        calls = set(CALL.findall(body))
        for name in direct:
            if name not in calls:
                bad.append('%s:%d: %s: Called: names %s, which the body '
                           'does not call' % (path, line, fn, name))
        for name in sorted(set(ERA_CALL.findall(body))):
            if name not in direct and name not in via:
                bad.append('%s:%d: %s: the body calls %s, which Called: '
                           'does not name' % (path, line, fn, name))
    return bad


def planted():
    """The check must catch a stale name and an unnamed ERFA call."""
    defs = {'f_one': 'eraAnp(x);\nhelper(y);', 'f_two': 'eraAnp(x);'}
    stale = '/*\n * Called:\n *   eraAnp, helper, eraRxp\n */\nvoid f_one(void);\n'
    unnamed = '/*\n * Called:\n *   helper\n */\nvoid f_two(void);\n'
    good = '/*\n * Called:\n *   eraAnp, helper\n */\nvoid f_one(void);\n'
    return (len(check_text('stale', stale, defs)) == 1 and
            len(check_text('unnamed', unnamed, defs)) == 2 and
            check_text('good', good, defs) == [])


def main():
    src = sys.argv[1] if len(sys.argv) > 1 else '.'
    if not planted():
        print('called: the check missed a planted mismatch')
        return 1
    defs = bodies(src)
    bad, n = [], 0
    for top in ('include', 'daemon'):
        for root, _, files in os.walk(os.path.join(src, top)):
            for f in sorted(files):
                if not f.endswith(('.c', '.h')):
                    continue
                p = os.path.join(root, f)
                text = open(p, encoding='utf-8').read()
                n += text.count('Called:')
                bad += check_text(os.path.relpath(p, src), text, defs)
    for b in bad:
        print('called: ' + b)
    if not bad:
        print('called: %d Called: lists match their bodies' % n)
    return 1 if bad else 0


if __name__ == '__main__':
    sys.exit(main())
