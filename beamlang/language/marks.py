"""Marks as folder names: a member mark -> the name of its package folder, safe on every common file system;
two marks that give one folder (`Q-1` and `Q-1.`, `CON` and `CON_`, `b-3` and `B-3`) name one package."""

from __future__ import annotations

RESERVED = {"CON", "PRN", "AUX", "NUL", *(f"COM{i}" for i in range(1, 10)), *(f"LPT{i}" for i in range(1, 10))}


def folder_name(mark: str) -> str:
    """A mark as a folder name that is safe on every common file system."""
    name = "".join(ch if ch.isalnum() or ch in "-_." else "_" for ch in mark).strip(".") or "member"
    return name + "_" if name.split(".")[0].upper() in RESERVED else name


def folder_key(mark: str) -> str:
    """What two marks must not share: their folder name as a file system that ignores case compares it."""
    return folder_name(mark).casefold()
