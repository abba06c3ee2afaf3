"""What a run gives a person.

Progress, tables and files, the workbook, pictures, plans, the HTML report and the calculation
sheet. Imports the earlier stages.
"""
