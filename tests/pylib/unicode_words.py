"""Word characters as the Unicode Character Database names them (Python's unicodedata),
for the tests' own references: which letters belong to scripts written without spaces."""
import unicodedata


def spaceless(c):
    """A Han ideograph or a kana (Unicode's character names), of scripts written without
    spaces between words."""
    return unicodedata.name(c, "").startswith(("CJK UNIFIED IDEOGRAPH", "HIRAGANA", "KATAKANA"))
