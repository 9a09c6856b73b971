"""The calc package: Analysis -> Markdown, HTML, SVG figures and results.json for one member."""
