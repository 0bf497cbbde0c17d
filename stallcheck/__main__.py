from stallcheck.cli import main

main()
