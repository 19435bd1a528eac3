"""Plain words for the YAML reader's syntax messages (the line number is kept by the caller).

PyYAML reports problems in parser terms ("expected <block end>, but found '<block mapping
start>'"); :func:`plain_words` says what is usually wrong in the file instead, and keeps the
reader's own words only for problems it does not know.
"""

from __future__ import annotations

#: (words in the reader's context or problem, plain explanation); first match wins
_PLAIN = (
    ("'\\t'", "a tab character: indent with spaces, not tabs"),
    ("found unhashable key", "a key must be a plain word, not a list or mapping"),
    ("undefined alias", "'*name' refers to no '&name' anchor above it"),
    ("another document", "the file holds more than one document ('---'); keep one"),
    ("scanning an anchor", "'&' must be followed by an anchor name"),
    ("scanning an alias", "'*' must be followed by an anchor name"),
    ("scanning a quoted scalar", "a quote is opened here and never closed"),
    ("flow sequence", "a list opened with '[' is not closed with ']' (or lacks a comma)"),
    ("flow mapping", "a mapping opened with '{' is not closed with '}' (or lacks a comma)"),
    ("mapping values are not allowed", "a ':' where no key can start here: check the "
     "indentation, or quote a value that holds ': '"),
    ("could not find expected ':'", "a line without 'key: value' (a ':' missing, or an "
     "unclosed quote)"),
    ("block end", "the indentation does not line up with the lines above: keys of one "
     "mapping must start in the same column"),
    ("block collection", "the indentation does not line up with the lines above: list items "
     "('- ') and keys of one level must start in the same column"),
    ("cannot start any token", "a character that cannot start a value here (quote the value)"),
    ("unexpected end of stream", "the file ends in the middle of a value"),
)


def plain_words(context: str | None, problem: str | None) -> str:
    """One plain sentence for a YAML syntax error given the reader's context and problem."""
    text = f"{context or ''} {problem or ''}"
    for needle, words in _PLAIN:
        if needle in text:
            return f"not valid YAML: {words}"
    return f"not valid YAML here ({(problem or context or 'syntax error').strip()})"
